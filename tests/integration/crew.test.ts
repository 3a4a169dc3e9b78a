/**
 * Crew services against the real MariaDB and the mail catcher: invites and resets followed
 * from the caught e-mail, single use and expiry of links, the last-admin rule, deactivation,
 * the own profile, and the audit trail they leave.
 */
import bcrypt from "bcryptjs";
import { and, eq, isNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { caughtMail, users, userTokens } from "../../db/schema";
import type { SessionUser } from "../../server/auth/options";
import type { MailCatcher } from "../../server/mail/catcher";
import { linkToken, mailTo, TEST_SMTP_PORT } from "../support/mail";

let db: Db;
let catcher: MailCatcher;
let admin: SessionUser;
let crew: typeof import("../../server/facades/crew");
let auth: typeof import("../../server/auth/options");
const stamp = `${process.pid}${Date.now() % 1_000_000}`;
const address = (who: string) => `${who}-${stamp}@tessera.test`;

async function errorOf(promise: Promise<unknown>): Promise<{ status: number; code: string; message: string; fields?: Record<string, string[]> }> {
  try {
    await promise;
  } catch (err) {
    const e = err as { status: number; code: string; message: string; fields?: Record<string, string[]> };
    return { status: e.status, code: e.code, message: e.message, fields: e.fields };
  }
  throw new Error("expected the call to fail");
}

/** Invites `who` and follows the caught e-mail's link to a first password. */
async function joined(who: string, role: "viewer" | "operator" | "admin", password = "first-password-1"): Promise<SessionUser> {
  const member = await crew.inviteMember(admin, { email: address(who), name: `Crew ${who}`, role });
  const token = linkToken((await mailTo(db, member.email)).text, "invite");
  await crew.acceptLink(token, password);
  return { id: String(member.id), email: member.email, name: member.name, role };
}

beforeAll(async () => {
  process.env.DATABASE_URL = inject("databaseUrl");
  process.env.NEXTAUTH_SECRET = "tessera-integration-secret";
  process.env.NEXTAUTH_URL = "http://tessera.example:8080";
  process.env.MAIL_CATCHER_PORT = String(TEST_SMTP_PORT);
  delete process.env.SMTP_HOST;
  db = openDb(inject("databaseUrl"));
  catcher = await (await import("../../server/mail/catcher")).startMailCatcher(db, TEST_SMTP_PORT);
  crew = await import("../../server/facades/crew");
  auth = await import("../../server/auth/options");
  const [row] = await db.select().from(users).where(eq(users.email, "admin@tessera.test"));
  admin = { id: String(row.id), email: row.email, name: row.name, role: "admin" };
});

afterAll(async () => {
  await catcher?.stop();
  await closeDb();
});

describe("invites", () => {
  it("e-mails a single-use link on the public URL that sets the first password and then signs in", async () => {
    const email = address("newcomer");
    const member = await crew.inviteMember(admin, { email: email.toUpperCase(), name: "Noor Haddad", role: "operator" });
    expect(member).toMatchObject({ email, name: "Noor Haddad", role: "operator", state: "invited", onCall: false });
    expect(await auth.verifyCredentials({ email, password: "any-password-at-all" })).toBeNull();

    const mail = await mailTo(db, email);
    expect(mail.subject).toBe("You are invited to Tessera");
    expect(mail.text).toContain("http://tessera.example:8080/invite/");
    expect(mail.text).toContain("Ada Okafor");
    expect(mail.html).toContain('href="http://tessera.example:8080/invite/');
    const token = linkToken(mail.text, "invite");

    const [stored] = await db.select().from(userTokens).where(eq(userTokens.userId, member.id));
    expect(stored.tokenHash).not.toContain(token);
    expect(stored.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    const hoursValid = (stored.expiresAt.getTime() - stored.createdAt.getTime()) / 3600_000;
    expect(hoursValid).toBeCloseTo(72, 1);

    expect(await crew.linkState(token)).toEqual({ state: "valid", kind: "invite", email, name: "Noor Haddad" });
    expect(await crew.acceptLink(token, "noor-first-password")).toEqual({ kind: "invite", email });
    expect(await auth.verifyCredentials({ email, password: "noor-first-password" })).toMatchObject({ email, role: "operator" });
    expect((await crew.listCrew()).find((m) => m.id === member.id)?.state).toBe("active");

    const reused = await errorOf(crew.acceptLink(token, "another-password-9"));
    expect(reused).toMatchObject({ status: 410, code: "gone:auth-links" });
    expect(reused.message).toMatch(/already been used/);
    expect(await crew.linkState(token)).toEqual({ state: "used" });
    expect(await auth.verifyCredentials({ email, password: "noor-first-password" })).not.toBeNull();
  });

  it("refuses an expired link with 410 and leaves the account without a password", async () => {
    const member = await crew.inviteMember(admin, { email: address("late"), name: "Late Comer", role: "viewer" });
    const token = linkToken((await mailTo(db, member.email)).text, "invite");
    await db.update(userTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(userTokens.userId, member.id));
    expect(await crew.linkState(token)).toEqual({ state: "expired" });
    const expired = await errorOf(crew.acceptLink(token, "too-late-password"));
    expect(expired).toMatchObject({ status: 410, code: "gone:auth-links" });
    expect(expired.message).toMatch(/expired; ask an admin to send the invite again/);
    const [row] = await db.select().from(users).where(eq(users.id, member.id));
    expect(row.passwordHash).toBe("");
  });

  it("answers 404 for a link Tessera never sent", async () => {
    expect(await crew.linkState("x".repeat(43))).toEqual({ state: "unknown" });
    expect(await errorOf(crew.acceptLink("x".repeat(43), "whatever-password"))).toMatchObject({ status: 404, code: "not_found:auth-links" });
    expect(await errorOf(crew.acceptLink("short", "whatever-password"))).toMatchObject({ status: 404 });
  });

  it("refuses a second invite to the same address with 409 and keeps the first", async () => {
    const email = address("twice");
    const first = await crew.inviteMember(admin, { email, name: "First Name", role: "viewer" });
    const again = await errorOf(crew.inviteMember(admin, { email, name: "Second Name", role: "admin" }));
    expect(again).toMatchObject({ status: 409, code: "conflict:users", fields: { email: ["This e-mail address already has an account."] } });
    const rows = await db.select().from(users).where(eq(users.email, email));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ id: first.id, name: "First Name", role: "viewer" });
  });

  it("sends the invite again for a user without a password, and the older link stops working", async () => {
    const member = await crew.inviteMember(admin, { email: address("resend"), name: "Re Send", role: "viewer" });
    const firstToken = linkToken((await mailTo(db, member.email)).text, "invite");
    expect(await crew.sendMemberLink(admin, member.id)).toEqual({ kind: "invite", email: member.email });
    await expect.poll(async () => (await db.select().from(caughtMail)).filter((m) => m.to.includes(member.email)).length).toBe(2);
    const secondToken = linkToken((await mailTo(db, member.email)).text, "invite");
    expect(secondToken).not.toBe(firstToken);
    expect(await errorOf(crew.acceptLink(firstToken, "old-link-password"))).toMatchObject({ status: 410 });
    await crew.acceptLink(secondToken, "new-link-password");
    expect(await auth.verifyCredentials({ email: member.email, password: "new-link-password" })).not.toBeNull();
  });
});

describe("mail failures", () => {
  it("keeps the invited user when the mail cannot be sent, says so with 503, and the resend works later", async () => {
    const email = address("unmailed");
    process.env.MAIL_CATCHER_PORT = "9";
    let failure: Awaited<ReturnType<typeof errorOf>>;
    try {
      failure = await errorOf(crew.inviteMember(admin, { email, name: "Un Mailed", role: "viewer" }));
    } finally {
      process.env.MAIL_CATCHER_PORT = String(TEST_SMTP_PORT);
    }
    expect(failure).toMatchObject({ status: 503, code: "unavailable:users" });
    expect(failure.message).toBe(`The invite for ${email} is saved, but the e-mail to ${email} could not be sent; use Resend invite on the crew page to try again.`);
    const member = (await crew.listCrew()).find((m) => m.email === email)!;
    expect(member).toMatchObject({ state: "invited", role: "viewer" });
    expect(await crew.sendMemberLink(admin, member.id)).toEqual({ kind: "invite", email });
    await crew.acceptLink(linkToken((await mailTo(db, email)).text, "invite"), "mailed-at-last");
    expect(await auth.verifyCredentials({ email, password: "mailed-at-last" })).not.toBeNull();
  });
});

describe("roles, deactivation and the last admin", () => {
  it("applies a role change to the user's next request", async () => {
    const user = await joined("promoted", "viewer");
    expect((await auth.activeSessionUser(user))?.role).toBe("viewer");
    expect(await crew.changeMember(admin, Number(user.id), { role: "operator" })).toMatchObject({ role: "operator" });
    expect((await auth.activeSessionUser(user))?.role).toBe("operator");
  });

  it("stops a deactivated user from signing in and ends their session; reactivation restores both", async () => {
    const user = await joined("leaver", "operator", "leaver-password-1");
    expect(await crew.changeMember(admin, Number(user.id), { disabled: true })).toMatchObject({ state: "deactivated" });
    expect(await auth.verifyCredentials({ email: user.email, password: "leaver-password-1" })).toBeNull();
    expect(await auth.activeSessionUser(user)).toBeNull();
    expect(await errorOf(crew.sendMemberLink(admin, Number(user.id)))).toMatchObject({ status: 409, code: "conflict:users" });
    await crew.changeMember(admin, Number(user.id), { disabled: false });
    expect(await auth.verifyCredentials({ email: user.email, password: "leaver-password-1" })).toMatchObject({ role: "operator" });
  });

  it("refuses to demote or deactivate the last active admin with 409, and allows it once there is another", async () => {
    const admins = await db.select().from(users).where(and(eq(users.role, "admin"), isNull(users.disabledAt)));
    expect(admins.map((a) => a.email)).toEqual(["admin@tessera.test"]);
    const id = Number(admin.id);
    const demote = await errorOf(crew.changeMember(admin, id, { role: "operator" }));
    expect(demote).toMatchObject({ status: 409, code: "conflict:users" });
    expect(demote.message).toBe("Ada Okafor is the last active admin and cannot be made operator; make another user admin first.");
    const deactivate = await errorOf(crew.changeMember(admin, id, { disabled: true, onCall: true }));
    expect(deactivate.message).toMatch(/last active admin and cannot be deactivated/);
    const [unchanged] = await db.select().from(users).where(eq(users.id, id));
    expect(unchanged).toMatchObject({ role: "admin", disabledAt: null, onCall: false });

    const second = await joined("second-admin", "admin");
    try {
      // Two admins demoting each other at once: the row locks let exactly one through.
      const results = await Promise.allSettled([
        crew.changeMember(second, id, { role: "viewer" }),
        crew.changeMember(admin, Number(second.id), { role: "viewer" }),
      ]);
      expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
      const refused = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
      expect(refused.reason).toMatchObject({ status: 409, code: "conflict:users" });
      const left = await db.select().from(users).where(and(eq(users.role, "admin"), isNull(users.disabledAt)));
      expect(left).toHaveLength(1);
    } finally {
      await db.update(users).set({ role: "admin" }).where(eq(users.id, id));
      await db.update(users).set({ role: "viewer", disabledAt: new Date() }).where(eq(users.id, Number(second.id)));
    }
  });

  it("marks a user on call and off again", async () => {
    const user = await joined("pager", "operator");
    expect(await crew.changeMember(admin, Number(user.id), { onCall: true })).toMatchObject({ onCall: true });
    expect(await crew.changeMember(admin, Number(user.id), { onCall: false })).toMatchObject({ onCall: false });
  });

  it("answers 404 for a user that does not exist", async () => {
    expect(await errorOf(crew.changeMember(admin, 987_654_321, { role: "viewer" }))).toMatchObject({ status: 404, code: "not_found:users" });
  });
});

describe("password reset and the own profile", () => {
  it("mails a one-hour reset link for a known address and nothing for an unknown one", async () => {
    const user = await joined("forgetful", "viewer", "forgotten-password");
    const before = (await db.select().from(caughtMail)).length;
    await crew.requestReset(address("nobody-here"));
    await crew.requestReset(user.email);
    const mail = await mailTo(db, user.email);
    expect(mail.subject).toBe("Reset your Tessera password");
    expect((await db.select().from(caughtMail)).length).toBe(before + 1);
    const token = linkToken(mail.text, "reset");
    const [link] = await db.select().from(userTokens).where(and(eq(userTokens.userId, Number(user.id)), eq(userTokens.kind, "reset")));
    expect((link.expiresAt.getTime() - link.createdAt.getTime()) / 60_000).toBeCloseTo(60, 0);
    await crew.acceptLink(token, "remembered-password");
    expect(await auth.verifyCredentials({ email: user.email, password: "forgotten-password" })).toBeNull();
    expect(await auth.verifyCredentials({ email: user.email, password: "remembered-password" })).not.toBeNull();
    const reused = await errorOf(crew.acceptLink(token, "third-password-x"));
    expect(reused).toMatchObject({ status: 410 });
    expect(reused.message).toMatch(/ask for a new one from the sign-in page/);
  });

  it("sends at most three reset mails an hour to one address", async () => {
    const user = await joined("hammered", "viewer");
    for (let i = 0; i < 5; i += 1) await crew.requestReset(user.email);
    await expect.poll(async () => (await db.select().from(caughtMail)).filter((m) => m.to.includes(user.email) && m.subject.startsWith("Reset")).length).toBe(3);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect((await db.select().from(caughtMail)).filter((m) => m.to.includes(user.email) && m.subject.startsWith("Reset")).length).toBe(3);
  });

  it("changes the own password only with the current one, and the name", async () => {
    const user = await joined("self", "viewer", "self-password-1");
    const wrong = await errorOf(crew.updateMe(user, { currentPassword: "not-it", newPassword: "self-password-2", name: "Changed Too" }));
    expect(wrong).toMatchObject({ status: 400, code: "bad_request:me", fields: { currentPassword: ["This is not your current password."] } });
    const [kept] = await db.select().from(users).where(eq(users.id, Number(user.id)));
    expect(kept.name).toBe("Crew self");
    expect(await bcrypt.compare("self-password-1", kept.passwordHash)).toBe(true);
    expect(await crew.updateMe(user, { currentPassword: "self-password-1", newPassword: "self-password-2", name: "Sam Self" })).toMatchObject({ name: "Sam Self" });
    expect(await auth.verifyCredentials({ email: user.email, password: "self-password-2" })).toMatchObject({ name: "Sam Self" });
  });
});

describe("audit", () => {
  it("records who invited whom, role changes and deactivation, filtered by user and action", async () => {
    const user = await joined("audited", "viewer");
    await crew.changeMember(admin, Number(user.id), { role: "operator", onCall: true });
    await crew.changeMember(admin, Number(user.id), { disabled: true });
    const mine = await crew.listAudit(crew.AuditQuery.parse({ user: admin.id, limit: 200 }));
    const about = mine.items.filter((i) => i.target === user.email).map((i) => [i.action, i.userName, i.detail]);
    expect(about).toEqual([
      ["deactivate", "Ada Okafor", { userId: Number(user.id) }],
      ["on-call", "Ada Okafor", { userId: Number(user.id), onCall: true }],
      ["role-change", "Ada Okafor", { userId: Number(user.id), from: "viewer", to: "operator" }],
      ["invite", "Ada Okafor", { userId: Number(user.id), role: "viewer" }],
    ]);
    const accepted = await crew.listAudit(crew.AuditQuery.parse({ action: "invite-accepted", user: user.id }));
    expect(accepted.items.map((i) => i.target)).toEqual([user.email]);
    expect(await crew.auditActions()).toEqual(expect.arrayContaining(["invite", "invite-accepted", "role-change", "deactivate", "on-call"]));
  });

  it("pages on the server and bounds by time", async () => {
    const { writeAudit } = await import("../../server/audit/audit");
    const action = `probe-${stamp}`;
    for (const n of [1, 2, 3, 4, 5]) await writeAudit(db, Number(admin.id), action, `target-${n}`);
    const page1 = await crew.listAudit(crew.AuditQuery.parse({ action, limit: "2" }));
    const page3 = await crew.listAudit(crew.AuditQuery.parse({ action, limit: "2", page: "3" }));
    expect(page1.total).toBe(5);
    expect(page1.items.map((i) => i.target)).toEqual(["target-5", "target-4"]);
    expect(page3.items.map((i) => i.target)).toEqual(["target-1"]);
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    expect((await crew.listAudit(crew.AuditQuery.parse({ action, from: tomorrow }))).total).toBe(0);
    const today = new Date().toISOString().slice(0, 10);
    expect((await crew.listAudit(crew.AuditQuery.parse({ action, to: today }))).total).toBe(5);
    expect(crew.AuditQuery.safeParse({ from: "last tuesday" }).success).toBe(false);
  });
});

describe("reset request limit", () => {
  // Last in the file: the overall limit is per process and would refuse later requests.
  it("refuses the 31st reset request within a minute with 429", async () => {
    let accepted = 0;
    let refused: Awaited<ReturnType<typeof errorOf>> | undefined;
    for (let i = 0; i < 40 && !refused; i += 1) {
      try {
        await crew.requestReset(address(`flood-${i}`));
        accepted += 1;
      } catch (err) {
        refused = { status: (err as { status: number }).status, code: (err as { code: string }).code, message: (err as Error).message };
      }
    }
    // Earlier tests in this file used a few of the 30.
    expect(accepted).toBeLessThanOrEqual(30);
    expect(accepted).toBeGreaterThanOrEqual(20);
    expect(refused).toEqual({ status: 429, code: "rate_limited:auth-links", message: "Too many reset requests just now; wait a minute and try again." });
  });
});
