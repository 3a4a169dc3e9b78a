/**
 * next-auth configuration: e-mail and password against bcrypt hashes in MariaDB,
 * JWT sessions that carry the user's id and role.
 */
import bcrypt from "bcryptjs";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { findUserByEmail, findUserById } from "../../db/queries/users";
import { ROLES } from "../../lib/vocabulary";
import { config } from "../config";
import { appDb } from "../db";
import { logger } from "../logger";
import { SIGN_IN_RATE_LIMITED } from "../../lib/crew/sign-in-errors";
import { clientAddress, createSignInThrottle } from "./sign-in-limit";

const CredentialsSchema = z.object({
  email: z.string().trim().toLowerCase().email(),
  password: z.string().min(1).max(200),
});

export const SessionUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
});
export type SessionUser = z.infer<typeof SessionUserSchema>;

/** Checks an e-mail and password; null when either is wrong or the account is disabled. */
export async function verifyCredentials(raw: unknown): Promise<SessionUser | null> {
  const parsed = CredentialsSchema.safeParse(raw);
  if (!parsed.success) return null;
  const user = await findUserByEmail(appDb(), parsed.data.email);
  // An invited user has no password until they follow their link.
  if (!user || user.disabledAt || !user.passwordHash) return null;
  const ok = await bcrypt.compare(parsed.data.password, user.passwordHash);
  if (!ok) {
    logger.info({ email: parsed.data.email }, "sign-in refused: wrong password");
    return null;
  }
  return { id: String(user.id), email: user.email, name: user.name, role: user.role };
}

const throttle = createSignInThrottle();

/**
 * The credentials provider's check behind the throttle: refuses with SIGN_IN_RATE_LIMITED while
 * the account or the address is limited, and counts each failure (null) against both.
 */
export async function authorizeSignIn(raw: unknown, headers: Record<string, string | string[] | undefined>): Promise<SessionUser | null> {
  const email = CredentialsSchema.shape.email.safeParse((raw as { email?: unknown } | null)?.email);
  const account = email.success ? email.data : null;
  const address = clientAddress(headers, config().TRUSTED_PROXY);
  if (throttle.limited(account, address)) {
    logger.warn({ email: account, address }, "sign-in refused: too many failed attempts");
    throw new Error(SIGN_IN_RATE_LIMITED);
  }
  const user = await verifyCredentials(raw);
  if (user) return user;
  throttle.failed(account, address);
  return null;
}

/**
 * The session's user as the database has it now: null once the account is deactivated or
 * gone, and the current role and name, so an admin's change applies on the user's next request.
 */
export async function activeSessionUser(claims: SessionUser): Promise<SessionUser | null> {
  const user = await findUserById(appDb(), Number(claims.id));
  if (!user || user.disabledAt) return null;
  return { id: String(user.id), email: user.email, name: user.name, role: user.role };
}

export function authOptions(): NextAuthOptions {
  return {
    secret: config().NEXTAUTH_SECRET,
    session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
    // Errors too go to the sign-in page, which reads `?error=` and says what went wrong.
    pages: { signIn: "/sign-in", error: "/sign-in" },
    providers: [
      CredentialsProvider({
        name: "Tessera account",
        credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
        authorize: (credentials, req) => authorizeSignIn(credentials, req.headers ?? {}),
      }),
    ],
    callbacks: {
      jwt({ token, user }) {
        if (user) {
          const u = user as SessionUser;
          token.uid = u.id;
          token.role = u.role;
        }
        return token;
      },
      async session({ session, token }) {
        const parsed = SessionUserSchema.safeParse({
          id: token.uid,
          email: token.email,
          name: token.name,
          role: token.role,
        });
        const fresh = parsed.success ? await activeSessionUser(parsed.data) : null;
        const holder = session as unknown as { user?: SessionUser };
        if (fresh) holder.user = fresh;
        else delete holder.user;
        return session;
      },
    },
  };
}

/** Reads the signed-in user from a decoded next-auth JWT; null when it lacks our claims. */
export function userFromToken(token: unknown): SessionUser | null {
  if (!token || typeof token !== "object") return null;
  const t = token as Record<string, unknown>;
  const parsed = SessionUserSchema.safeParse({ id: t.uid, email: t.email, name: t.name, role: t.role });
  return parsed.success ? parsed.data : null;
}
