import { describe, expect, it } from "vitest";
import { ACCOUNT_FAILURES, ADDRESS_FAILURES, clientAddress, createSignInThrottle, PEER_HEADER, SIGN_IN_WINDOW_MS } from "./sign-in-limit";

describe("clientAddress", () => {
  const headers = { "x-forwarded-for": "198.51.100.9, 203.0.113.4", [PEER_HEADER]: "10.0.0.2" };

  it("ignores X-Forwarded-For unless a trusted proxy appended it", () => {
    expect(clientAddress(headers, false)).toBe("10.0.0.2");
  });

  it("takes the entry the trusted proxy appended, not the client's own", () => {
    expect(clientAddress(headers, true)).toBe("203.0.113.4");
  });

  it("falls back to the socket peer, then to one shared bucket", () => {
    expect(clientAddress({ [PEER_HEADER]: "10.0.0.2" }, true)).toBe("10.0.0.2");
    expect(clientAddress({}, false)).toBe("unknown");
  });
});

describe("createSignInThrottle", () => {
  it("limits an account after its failures, from any address, until the window passes", () => {
    const throttle = createSignInThrottle();
    for (let i = 0; i < ACCOUNT_FAILURES; i++) {
      expect(throttle.limited("a@tessera.test", `10.0.0.${i}`, i)).toBe(false);
      throttle.failed("a@tessera.test", `10.0.0.${i}`, i);
    }
    expect(throttle.limited("a@tessera.test", "10.9.9.9", 100)).toBe(true);
    expect(throttle.limited("b@tessera.test", "10.0.0.1", 100)).toBe(false);
    expect(throttle.limited("a@tessera.test", "10.9.9.9", SIGN_IN_WINDOW_MS + ACCOUNT_FAILURES)).toBe(false);
  });

  it("limits an address after its failures across accounts", () => {
    const throttle = createSignInThrottle();
    for (let i = 0; i < ADDRESS_FAILURES; i++) throttle.failed(`u${i}@tessera.test`, "10.0.0.1", i);
    expect(throttle.limited("fresh@tessera.test", "10.0.0.1", 100)).toBe(true);
    expect(throttle.limited("fresh@tessera.test", "10.0.0.2", 100)).toBe(false);
    expect(throttle.limited(null, "10.0.0.1", 100)).toBe(true);
  });
});
