/**
 * What the sign-in page says for each error next-auth hands back as `?error=`: the server's
 * throttle and next-auth's own codes. Shared by the throttle, which raises the code, and the
 * form, which shows the sentence.
 */

/** Raised by the sign-in throttle while an account or an address has failed too often. */
export const SIGN_IN_RATE_LIMITED = "SignInRateLimited";

/** Minutes a throttled sign-in waits; the window of the server's counters. */
export const SIGN_IN_WINDOW_MINUTES = 15;

/** The sentence for an error code, or null when there is nothing to say. */
export function signInErrorMessage(code: string | null | undefined): string | null {
  if (!code) return null;
  if (code === SIGN_IN_RATE_LIMITED) {
    return `Too many failed sign-ins for this account or from this address. Sign-in is paused for ${SIGN_IN_WINDOW_MINUTES} minutes; try again after that.`;
  }
  if (code === "CredentialsSignin") return "That e-mail and password do not match an active Tessera account.";
  return "Signing in did not work; try again.";
}
