/**
 * Sign-in of the /ops namespace: the same next-auth session cookie the pages use, and an
 * Origin check so another site cannot open a socket with the operator's cookie.
 */
import { getToken } from "next-auth/jwt";
import { activeSessionUser, userFromToken, type SessionUser } from "../auth/options";

export function parseCookieHeader(header: string | undefined): Record<string, string> {
  const cookies: Record<string, string> = {};
  if (!header) return cookies;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq < 0) continue;
    const name = part.slice(0, eq).trim();
    const value = part.slice(eq + 1).trim();
    if (!name) continue;
    try {
      cookies[name] = decodeURIComponent(value);
    } catch {
      cookies[name] = value;
    }
  }
  return cookies;
}

export type OpsHandshake = { ok: true; user: SessionUser } | { ok: false; code: "unauthorized" | "bad_origin" };

export async function checkOpsHandshake(
  headers: Record<string, string | string[] | undefined>,
  opts: { secret: string; allowedOrigins: string[] },
): Promise<OpsHandshake> {
  const origin = typeof headers.origin === "string" ? headers.origin : undefined;
  if (origin && !opts.allowedOrigins.includes(origin)) return { ok: false, code: "bad_origin" };
  const cookieHeader = typeof headers.cookie === "string" ? headers.cookie : undefined;
  const token = await getToken({
    req: { cookies: parseCookieHeader(cookieHeader), headers } as never,
    secret: opts.secret,
  });
  const claims = userFromToken(token);
  // A deactivated user's cookie stays signed; the database decides whether it still counts.
  const user = claims ? await activeSessionUser(claims) : null;
  return user ? { ok: true, user } : { ok: false, code: "unauthorized" };
}
