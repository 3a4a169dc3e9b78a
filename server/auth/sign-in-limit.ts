/**
 * Sign-in throttle: failed attempts are counted per account and per client address, and
 * once either has failed too often in the window every attempt is refused, the right
 * password included, until the window passes. Only failures count, so people and scripts
 * that sign in correctly again and again are never slowed down.
 */
import { SIGN_IN_WINDOW_MINUTES } from "../../lib/crew/sign-in-errors";
import { createRateLimiter } from "../crew/rate-limit";

export const ACCOUNT_FAILURES = 5;
export const ADDRESS_FAILURES = 20;
export const SIGN_IN_WINDOW_MS = SIGN_IN_WINDOW_MINUTES * 60_000;

/**
 * The custom server writes the TCP peer's address into this header of every request,
 * replacing whatever the client sent, because Next's route handlers cannot see the socket.
 */
export const PEER_HEADER = "x-tessera-peer";

type Headers = Record<string, string | string[] | undefined>;

const first = (value: string | string[] | undefined) => (Array.isArray(value) ? value[0] : value);

/**
 * The address a sign-in came from. Behind a trusted proxy it is the last X-Forwarded-For
 * entry, the one that proxy appended (earlier entries are the client's to forge). Otherwise
 * it is the socket's peer; requests that reach Next without the custom server in front
 * have neither and share one bucket, which throttles more, never less.
 */
export function clientAddress(headers: Headers, trustedProxy: boolean): string {
  if (trustedProxy) {
    const forwarded = first(headers["x-forwarded-for"])
      ?.split(",")
      .map((s) => s.trim())
      .filter(Boolean)
      .at(-1);
    if (forwarded) return forwarded;
  }
  return first(headers[PEER_HEADER]) || "unknown";
}

export interface SignInThrottle {
  /** Whether the account or the address has failed too often within the window. */
  limited(account: string | null, address: string, now?: number): boolean;
  /** Counts one failed attempt against both. */
  failed(account: string | null, address: string, now?: number): void;
}

export function createSignInThrottle(): SignInThrottle {
  const accounts = createRateLimiter(ACCOUNT_FAILURES, SIGN_IN_WINDOW_MS);
  const addresses = createRateLimiter(ADDRESS_FAILURES, SIGN_IN_WINDOW_MS);
  return {
    limited(account, address, now = Date.now()) {
      return (account !== null && accounts.blocked(account, now)) || addresses.blocked(address, now);
    },
    failed(account, address, now = Date.now()) {
      if (account !== null) accounts.take(account, now);
      addresses.take(address, now);
    },
  };
}
