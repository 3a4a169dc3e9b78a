/** Password sign-in against the seeded accounts in the real MariaDB. */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb } from "../../db/client";

let verifyCredentials: typeof import("../../server/auth/options").verifyCredentials;

beforeAll(async () => {
  process.env.DATABASE_URL = inject("databaseUrl");
  process.env.NEXTAUTH_SECRET = "tessera-integration-secret";
  ({ verifyCredentials } = await import("../../server/auth/options"));
});

afterAll(async () => {
  await closeDb();
});

describe("credentials", () => {
  it("signs in each demo account with its role", async () => {
    expect(await verifyCredentials({ email: "admin@tessera.test", password: "demo-tessera" })).toMatchObject({ role: "admin", email: "admin@tessera.test" });
    expect(await verifyCredentials({ email: "Operator@Tessera.test", password: "demo-tessera" })).toMatchObject({ role: "operator" });
    expect(await verifyCredentials({ email: "viewer@tessera.test", password: "demo-tessera" })).toMatchObject({ role: "viewer" });
  });

  it("refuses a wrong password and an unknown account", async () => {
    expect(await verifyCredentials({ email: "admin@tessera.test", password: "demo-tesserA" })).toBeNull();
    expect(await verifyCredentials({ email: "nobody@tessera.test", password: "demo-tessera" })).toBeNull();
  });

  it("refuses malformed input without touching the database", async () => {
    expect(await verifyCredentials({ email: "not an email", password: "x" })).toBeNull();
    expect(await verifyCredentials(null)).toBeNull();
  });
});
