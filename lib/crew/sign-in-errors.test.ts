import { describe, expect, it } from "vitest";
import { SIGN_IN_RATE_LIMITED, signInErrorMessage } from "./sign-in-errors";

describe("signInErrorMessage", () => {
  it("says that sign-in is paused, and for how long, when the throttle refused it", () => {
    expect(signInErrorMessage(SIGN_IN_RATE_LIMITED)).toMatch(/Too many failed sign-ins.*paused for 15 minutes/);
  });

  it("keeps the wrong-password sentence, has a fallback for other codes and nothing for none", () => {
    expect(signInErrorMessage("CredentialsSignin")).toBe("That e-mail and password do not match an active Tessera account.");
    expect(signInErrorMessage("Configuration")).toBe("Signing in did not work; try again.");
    expect(signInErrorMessage(undefined)).toBeNull();
    expect(signInErrorMessage("")).toBeNull();
  });
});
