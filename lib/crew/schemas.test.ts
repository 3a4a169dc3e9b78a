import { describe, expect, it } from "vitest";
import { InviteSchema, MePatchSchema, UserPatchSchema } from "./schemas";

const errors = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  (r.error?.issues ?? []).map((i) => [i.path.join("."), i.message]);

describe("crew schemas", () => {
  it("keeps invited addresses trimmed and lower-case, and names the fields at fault", () => {
    expect(InviteSchema.parse({ email: "  Noor.Haddad@Tessera.TEST ", name: " Noor ", role: "operator" })).toEqual({ email: "noor.haddad@tessera.test", name: "Noor", role: "operator" });
    expect(errors(InviteSchema.safeParse({ email: "noor", name: "", role: "captain" })).map(([path]) => path)).toEqual(["email", "name", "role"]);
  });

  it("wants at least one change in a user patch and refuses fields it does not know", () => {
    expect(UserPatchSchema.safeParse({ onCall: false }).success).toBe(true);
    expect(errors(UserPatchSchema.safeParse({}))).toEqual([["", "Give role, disabled or onCall."]]);
    expect(UserPatchSchema.safeParse({ role: "viewer", passwordHash: "x" }).success).toBe(false);
  });

  it("asks for the current password with a new one, and for a long enough new one", () => {
    expect(MePatchSchema.safeParse({ name: "Sam" }).success).toBe(true);
    expect(errors(MePatchSchema.safeParse({ newPassword: "long-enough-1" }))).toEqual([["currentPassword", "Enter your current password to change it."]]);
    expect(errors(MePatchSchema.safeParse({ currentPassword: "old", newPassword: "short" }))).toEqual([["newPassword", "Use at least 10 characters."]]);
    expect(errors(MePatchSchema.safeParse({}))).toEqual([["", "Give a name or a new password."]]);
  });
});
