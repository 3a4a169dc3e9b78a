/**
 * Sign-in hardening against the running server: the session cookie's attributes, next-auth's
 * CSRF check, failed-attempt limits per account and per address, and secrets stored only as
 * hashes. Limited attempts come from addresses of their own (X-Forwarded-For, which the test
 * server trusts) and accounts made here, so no other test's sign-ins are slowed.
 */
import bcrypt from "bcryptjs";
import { eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { verifyRobotKey } from "../../db/robot-keys";
import { DEMO_USERS } from "../../db/seed";
import { audit, robots, users } from "../../db/schema";
import { withBrowser } from "../support/browser";
import { insertTestRobot } from "../support/robot-fixtures";
import { attemptSignIn, signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const stamp = `${process.pid}${Date.now() % 1_000_000}`;
const PASSWORD = "hardening-pass-1";
let db: Db;

beforeAll(() => {
  db = openDb(inject("databaseUrl"));
});

afterAll(async () => {
  await closeDb();
});

/** An account nobody else signs in to, straight in the database. */
async function freshAccount(who: string): Promise<string> {
  const email = `${who}-${stamp}@tessera.test`;
  await db.insert(users).values({ email, name: `Hardening ${who}`, role: "viewer", passwordHash: await bcrypt.hash(PASSWORD, 4) });
  return email;
}

/** A client address of the documentation range (RFC 5737) that only this test uses. */
const from = (n: number) => ({ "x-forwarded-for": `198.51.100.${n}` });

describe("session cookie and CSRF", () => {
  it("sets the session cookie HttpOnly and SameSite=Lax", async () => {
    const { sessionSetCookie } = await attemptSignIn(appUrl, "viewer@tessera.test", "demo-tessera");
    expect(sessionSetCookie).toBeDefined();
    const attributes = sessionSetCookie!.split(";").map((a) => a.trim().toLowerCase());
    expect(attributes).toContain("httponly");
    expect(attributes).toContain("samesite=lax");
    expect(attributes).toContain("path=/");
  });

  it("signs nobody in without the csrfToken that matches the csrf cookie", async () => {
    for (const csrfToken of [null, "", "0".repeat(64)]) {
      const attempt = await attemptSignIn(appUrl, "viewer@tessera.test", "demo-tessera", { csrfToken });
      expect(attempt.sessionSetCookie, `csrfToken ${csrfToken}`).toBeUndefined();
      expect(attempt.url).toMatch(/csrf=true/);
    }
  });
});

describe("failed sign-in limits", () => {
  it("refuses an account, even with the right password and from another address, after 5 wrong ones", async () => {
    const locked = await freshAccount("locked");
    for (let i = 0; i < 5; i++) expect((await attemptSignIn(appUrl, locked, `wrong-${i}`, { headers: from(1) })).error).toBe("CredentialsSignin");
    const right = await attemptSignIn(appUrl, locked, PASSWORD, { headers: from(2) });
    expect(right).toMatchObject({ sessionSetCookie: undefined, error: "SignInRateLimited" });

    const neighbour = await freshAccount("neighbour");
    expect((await attemptSignIn(appUrl, neighbour, PASSWORD, { headers: from(1) })).sessionSetCookie).toBeDefined();
    // Right passwords never count: the demo accounts sign in as often as the suite needs.
    for (let i = 0; i < 6; i++) expect((await attemptSignIn(appUrl, neighbour, PASSWORD, { headers: from(1) })).sessionSetCookie).toBeDefined();

    await withBrowser(async (context) => {
      const page = await context.newPage();
      await page.goto(`${appUrl}/sign-in`);
      await page.getByLabel("E-mail").fill(locked);
      await page.getByLabel("Password").fill(PASSWORD);
      await page.getByRole("button", { name: "Sign in" }).click();
      const alert = page.getByRole("alert").filter({ hasText: /\S/ });
      await alert.waitFor();
      expect(await alert.innerText()).toMatch(/Too many failed sign-ins for this account or from this address\. Sign-in is paused for 15 minutes/);
      expect(page.url()).toContain("/sign-in");
    });
  });

  it("refuses every account from an address after 20 failures there, and lets others in", async () => {
    for (let i = 0; i < 20; i++) expect((await attemptSignIn(appUrl, `nobody-${i}-${stamp}@tessera.test`, "guess", { headers: from(3) })).error).toBe("CredentialsSignin");
    const email = await freshAccount("crowded");
    expect(await attemptSignIn(appUrl, email, PASSWORD, { headers: from(3) })).toMatchObject({ sessionSetCookie: undefined, error: "SignInRateLimited" });
    expect((await attemptSignIn(appUrl, email, PASSWORD, { headers: from(4) })).sessionSetCookie).toBeDefined();
  });

  it("says why on the sign-in page a script-less form lands on", async () => {
    const bounce = await fetch(`${appUrl}/api/auth/error?error=SignInRateLimited`, { redirect: "manual" });
    expect(bounce.headers.get("location")).toMatch(/\/sign-in\?error=SignInRateLimited$/);
    const res = await fetch(`${appUrl}/sign-in?error=SignInRateLimited`);
    expect(await res.text()).toContain("Too many failed sign-ins for this account or from this address.");
  });
});

describe("stored secrets", () => {
  it("keeps passwords as bcrypt hashes that verify, seeded or changed through the app", async () => {
    const email = await freshAccount("changer");
    const cookie = await signInAs(appUrl, email, PASSWORD);
    const changed = await fetch(`${appUrl}/api/me`, {
      method: "PATCH",
      headers: { cookie, "content-type": "application/json" },
      body: JSON.stringify({ currentPassword: PASSWORD, newPassword: "hardening-pass-2" }),
    });
    expect(changed.status).toBe(200);
    const plain: Record<string, string> = { [email]: "hardening-pass-2", ...Object.fromEntries(DEMO_USERS.map((u) => [u.email, "demo-tessera"])) };
    const rows = await db.select().from(users).where(inArray(users.email, Object.keys(plain)));
    expect(rows).toHaveLength(4);
    for (const row of rows) {
      expect(row.passwordHash, row.email).toMatch(/^\$2[aby]\$\d{2}\$[./A-Za-z0-9]{53}$/);
      expect(await bcrypt.compare(plain[row.email], row.passwordHash), row.email).toBe(true);
      expect(JSON.stringify(row), row.email).not.toContain(plain[row.email]);
    }
  });

  it("keeps robot keys as SHA-256 hashes that verify, and writes the key nowhere else", async () => {
    const robot = await insertTestRobot(db);
    const admin = await signInAs(appUrl, "admin@tessera.test");
    const rotated = await fetch(`${appUrl}/api/robots/${robot.id}/key`, { method: "POST", headers: { cookie: admin } });
    expect(rotated.status).toBe(200);
    const { key } = (await rotated.json()) as { key: string };
    const [row] = await db.select().from(robots).where(eq(robots.id, robot.id));
    expect(row.keyHash).toMatch(/^[0-9a-f]{64}$/);
    expect(verifyRobotKey(key, row.keyHash)).toBe(true);
    expect(verifyRobotKey(robot.key, row.keyHash)).toBe(false);
    expect(JSON.stringify(row)).not.toContain(key);
    const trail = await db.select().from(audit).where(eq(audit.target, robot.id));
    expect(trail.length).toBeGreaterThan(0);
    expect(JSON.stringify(trail)).not.toContain(key);
  });
});
