/** Signing in the way scripts do: next-auth's own csrf and credentials endpoints. */

export interface SignInAttempt {
  /** The Cookie header to send next: the csrf cookie, plus the session cookie when signed in. */
  cookie: string;
  /** The session cookie's Set-Cookie line, attributes included; undefined when refused. */
  sessionSetCookie: string | undefined;
  /** next-auth's `?error=` code when refused (CredentialsSignin, SignInRateLimited, …). */
  error: string | null;
  /** Where next-auth sends the browser after the attempt. */
  url: string;
}

/**
 * One credentials sign-in. `headers` go on the credentials POST (an X-Forwarded-For, say);
 * `csrfToken` replaces the one next-auth issued, or leaves it out when null.
 */
export async function attemptSignIn(
  appUrl: string,
  email: string,
  password: string,
  opts: { headers?: Record<string, string>; csrfToken?: string | null } = {},
): Promise<SignInAttempt> {
  const csrfRes = await fetch(`${appUrl}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const cookie = csrfRes.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  const token = opts.csrfToken === undefined ? csrfToken : opts.csrfToken;
  const form = new URLSearchParams({ email, password, json: "true" });
  if (token !== null) form.set("csrfToken", token);
  const res = await fetch(`${appUrl}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie, ...opts.headers },
    body: form,
  });
  const sessionSetCookie = res.headers.getSetCookie().find((c) => c.startsWith("next-auth.session-token="));
  const url = res.headers.get("location") ?? ((await res.json()) as { url: string }).url;
  return {
    cookie: sessionSetCookie ? `${cookie}; ${sessionSetCookie.split(";")[0]}` : cookie,
    sessionSetCookie,
    error: new URL(url, appUrl).searchParams.get("error"),
    url,
  };
}

/** The Cookie header of a fresh session for `email` (demo password), or without a session token when refused. */
export async function signInAs(appUrl: string, email: string, password = "demo-tessera"): Promise<string> {
  return (await attemptSignIn(appUrl, email, password)).cookie;
}
