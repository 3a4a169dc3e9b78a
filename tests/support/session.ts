/** Signing in the way scripts do: next-auth's own csrf and credentials endpoints. */

/** The Cookie header of a fresh session for `email` (demo password), or without a session token when refused. */
export async function signInAs(appUrl: string, email: string, password = "demo-tessera"): Promise<string> {
  const csrfRes = await fetch(`${appUrl}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const cookie = csrfRes.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  const res = await fetch(`${appUrl}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const session = res.headers.getSetCookie().find((c) => c.startsWith("next-auth.session-token="));
  return session ? `${cookie}; ${session.split(";")[0]}` : cookie;
}
