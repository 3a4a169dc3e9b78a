/** Single-use links: 32 random bytes sent by e-mail, only their sha256 kept (like a password). */
import { createHash, randomBytes } from "node:crypto";
import type { LinkKind } from "../../lib/crew/schemas";

/** How long a link stays good: an invite waits for a newcomer, a reset is for now. */
export const LINK_TTL_MS: Record<LinkKind, number> = { invite: 72 * 3600_000, reset: 3600_000 };

export function hashLinkToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export function newLinkToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashLinkToken(token) };
}
