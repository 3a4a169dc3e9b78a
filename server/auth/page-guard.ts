/** Guards for server-rendered pages: redirect signed-out visitors, 403 for a missing role. */
import { getServerSession } from "next-auth";
import { forbidden, redirect } from "next/navigation";
import { connection } from "next/server";
import { roleAllows } from "../../lib/roles";
import type { Role } from "../../lib/vocabulary";
import { authOptions, type SessionUser } from "./options";

export async function currentUser(): Promise<SessionUser | null> {
  // Sessions are per request: never let a page that reads one be prerendered at build time.
  await connection();
  const session = await getServerSession(authOptions());
  return (session as unknown as { user?: SessionUser } | null)?.user ?? null;
}

/** The signed-in user when they hold `role`; otherwise sends them to sign-in or a 403 page. */
export async function requirePageRole(role: Role, from: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(from)}`);
  if (!roleAllows(user.role, role)) forbidden();
  return user;
}
