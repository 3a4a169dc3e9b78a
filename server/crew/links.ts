/**
 * The public side of e-mailed links: what a link is, setting a password through it, and
 * asking for a reset without revealing whether an address has an account.
 */
import { and, eq, isNull } from "drizzle-orm";
import { users, userTokens } from "../../db/schema";
import type { LinkKind, LinkState } from "../../lib/crew/schemas";
import { writeAudit } from "../audit/audit";
import { appDb } from "../db";
import { TesseraError } from "../errors";
import { logger } from "../logger";
import { sendMail } from "../mail/mailer";
import { hashPassword, issueLink, NO_PASSWORD } from "./members";
import { resetMail } from "./messages";
import { createRateLimiter } from "./rate-limit";
import { hashLinkToken } from "./tokens";

const SURFACE = "auth-links";

/** Tokens are 43 base64url characters; anything else is not worth a database look-up. */
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{43}$/;

/** Whether a link can still set a password, and for whom. */
export async function linkState(token: string, now = new Date()): Promise<LinkState> {
  if (!TOKEN_SHAPE.test(token)) return { state: "unknown" };
  const [row] = await appDb()
    .select({ token: userTokens, user: users })
    .from(userTokens)
    .innerJoin(users, eq(users.id, userTokens.userId))
    .where(eq(userTokens.tokenHash, hashLinkToken(token)))
    .limit(1);
  if (!row || row.user.disabledAt) return { state: "unknown" };
  if (row.token.usedAt) return { state: "used" };
  if (row.token.expiresAt <= now) return { state: "expired" };
  return { state: "valid", kind: row.token.kind, email: row.user.email, name: row.user.name };
}

function goneMessage(kind: LinkKind, why: "used" | "expired"): string {
  const again = kind === "invite" ? "ask an admin to send the invite again" : "ask for a new one from the sign-in page";
  return why === "used" ? `This link has already been used; ${again}.` : `This link has expired; ${again}.`;
}

/** Sets the password through a link, once; 410 when the link was used or has expired. */
export async function acceptLink(token: string, password: string): Promise<{ kind: LinkKind; email: string }> {
  const passwordHash = await hashPassword(password);
  return appDb().transaction(async (tx) => {
    const found = TOKEN_SHAPE.test(token)
      ? await tx.select().from(userTokens).where(eq(userTokens.tokenHash, hashLinkToken(token))).for("update")
      : [];
    const link = found[0];
    if (!link) throw new TesseraError("not_found", SURFACE, "This link is not one Tessera sent; check that the whole address was copied.");
    if (link.usedAt) throw new TesseraError("gone", SURFACE, goneMessage(link.kind, "used"));
    if (link.expiresAt <= new Date()) throw new TesseraError("gone", SURFACE, goneMessage(link.kind, "expired"));
    const [user] = await tx.select().from(users).where(eq(users.id, link.userId)).for("update");
    if (!user || user.disabledAt) throw new TesseraError("gone", SURFACE, "This account is deactivated; ask an admin of your site.");
    await tx.update(users).set({ passwordHash }).where(eq(users.id, user.id));
    // Every outstanding link of the user dies with this one: a password was just chosen.
    await tx.update(userTokens).set({ usedAt: new Date() }).where(and(eq(userTokens.userId, user.id), isNull(userTokens.usedAt)));
    await writeAudit(tx, user.id, link.kind === "invite" ? "invite-accepted" : "password-reset", user.email, { userId: user.id });
    return { kind: link.kind, email: user.email };
  });
}

/** A few requests per address per hour: enough for a typo, too few to flood a mailbox. */
const perAddress = createRateLimiter(3, 3600_000);
/** All requests together, so a script cycling addresses is slowed down too. */
const overall = createRateLimiter(30, 60_000);

/**
 * Mails a reset link when the address belongs to an active account that has a password.
 * Says nothing either way; only the overall rate limit answers differently (429).
 */
export async function requestReset(email: string): Promise<void> {
  if (!overall.take("all")) throw new TesseraError("rate_limited", SURFACE, "Too many reset requests just now; wait a minute and try again.");
  if (!perAddress.take(email)) return;
  const db = appDb();
  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  if (!user || user.disabledAt || user.passwordHash === NO_PASSWORD) return;
  const url = await db.transaction(async (tx) => {
    const link = await issueLink(tx, user.id, "reset", null);
    await writeAudit(tx, user.id, "reset-requested", user.email, { userId: user.id });
    return link;
  });
  try {
    await sendMail(resetMail(user, url));
  } catch (err) {
    logger.error({ err, userId: user.id }, "reset mail not sent");
  }
}
