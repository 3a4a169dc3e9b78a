/**
 * The crew, mail and audit routes against the running server: every admin route refused to
 * the signed-out (401) and to viewers and operators (403) with a clear body; an invite
 * followed from the sent-mail route to a first sign-in; link reuse, bad input, the last
 * admin, deactivation and role changes taking effect on the next request; resets; audit.
 */
import { beforeAll, describe, expect, inject, it } from "vitest";
import type { AuditItem, CaughtMail, CrewMember } from "../../lib/crew/schemas";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const stamp = `${process.pid}${Date.now() % 1_000_000}`;
const address = (who: string) => `${who}-${stamp}@tessera.test`;
let admin = "";
let operator = "";
let viewer = "";

async function call(method: string, path: string, opts: { cookie?: string; body?: unknown } = {}) {
  const res = await fetch(`${appUrl}${path}`, {
    method,
    headers: { ...(opts.cookie ? { cookie: opts.cookie } : {}), ...(opts.body !== undefined ? { "content-type": "application/json" } : {}) },
    body: opts.body === undefined ? undefined : typeof opts.body === "string" ? opts.body : JSON.stringify(opts.body),
  });
  return { status: res.status, body: (await res.json()) as Record<string, any> }; // eslint-disable-line @typescript-eslint/no-explicit-any
}

async function crew(): Promise<CrewMember[]> {
  return (await call("GET", "/api/users", { cookie: admin })).body.users as CrewMember[];
}

/** The token of the newest link of `kind` mailed to `to`, read through GET /api/mail as an admin would. */
async function mailedToken(to: string, kind: "invite" | "reset"): Promise<string> {
  let token: string | undefined;
  await expect
    .poll(async () => {
      const { items } = (await call("GET", "/api/mail?limit=100", { cookie: admin })).body as { items: CaughtMail[] };
      const mail = items.find((m) => m.to.includes(to) && new RegExp(`/${kind}/`).test(m.text ?? ""));
      token = mail ? new RegExp(`/${kind}/([A-Za-z0-9_-]{43})`).exec(mail.text ?? "")?.[1] : undefined;
      return token;
    })
    .toBeDefined();
  return token!;
}

/** Invites, accepts and signs in a new user; returns their id and session cookie. */
async function newcomer(who: string, role: "viewer" | "operator", password = "newcomer-password") {
  const email = address(who);
  const invited = await call("POST", "/api/users", { cookie: admin, body: { email, name: `Crew ${who}`, role } });
  expect(invited.status).toBe(201);
  expect((await call("POST", `/api/auth-links/${await mailedToken(email, "invite")}`, { body: { password } })).status).toBe(200);
  return { id: (invited.body.user as CrewMember).id, email, cookie: await signInAs(appUrl, email, password) };
}

beforeAll(async () => {
  [admin, operator, viewer] = await Promise.all(["admin", "operator", "viewer"].map((r) => signInAs(appUrl, `${r}@tessera.test`)));
});

describe("role fences", () => {
  const ADMIN_ROUTES: [string, string, string, unknown?][] = [
    ["GET", "/api/users", "users"],
    ["POST", "/api/users", "users", { email: "fenced@tessera.test", name: "Fenced", role: "viewer" }],
    ["PATCH", "/api/users/1", "users", { role: "viewer" }],
    ["POST", "/api/users/1/reset", "users"],
    ["GET", "/api/mail", "mail"],
    ["GET", "/api/audit", "audit"],
  ];

  it("answers signed-out requests with 401 and viewers and operators with 403, saying which role is needed", async () => {
    for (const [method, path, surface, body] of ADMIN_ROUTES) {
      expect(await call(method, path, { body }), `${method} ${path} signed out`).toEqual({ status: 401, body: { error: { code: `unauthorized:${surface}`, message: "Sign in first." } } });
      for (const [role, cookie] of [["viewer", viewer], ["operator", operator]] as const) {
        expect(await call(method, path, { cookie, body }), `${method} ${path} as ${role}`).toEqual({
          status: 403,
          body: { error: { code: `forbidden:${surface}`, message: `This needs the admin role; you are ${role}.` } },
        });
      }
    }
    expect((await crew()).filter((m) => m.email === "fenced@tessera.test")).toEqual([]);
    expect((await call("GET", "/api/me")).status).toBe(401);
    expect((await call("PATCH", "/api/me", { body: { name: "Nobody" } })).status).toBe(401);
  });

  it("lets every signed-in role read its own profile", async () => {
    for (const [role, cookie] of [["viewer", viewer], ["operator", operator], ["admin", admin]] as const) {
      const me = await call("GET", "/api/me", { cookie });
      expect(me.status).toBe(200);
      expect(me.body.user).toMatchObject({ email: `${role}@tessera.test`, role, state: "active" });
    }
  });
});

describe("invites", () => {
  it("follows an invite from the sent-mail route to a first sign-in, and refuses the link a second time with 410", async () => {
    const email = address("joiner");
    const invited = await call("POST", "/api/users", { cookie: admin, body: { email, name: "Joiner Ama", role: "operator" } });
    expect(invited.status).toBe(201);
    expect(invited.body.user).toMatchObject({ email, name: "Joiner Ama", role: "operator", state: "invited", onCall: false });
    expect((await signInAs(appUrl, email, "")).includes("next-auth.session-token")).toBe(false);

    const token = await mailedToken(email, "invite");
    expect(await call("GET", `/api/auth-links/${token}`)).toEqual({ status: 200, body: { state: "valid", kind: "invite", name: "Joiner Ama" } });
    const weak = await call("POST", `/api/auth-links/${token}`, { body: { password: "short" } });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields).toEqual({ password: ["Use at least 10 characters."] });

    expect(await call("POST", `/api/auth-links/${token}`, { body: { password: "joiner-first-pass" } })).toEqual({ status: 200, body: { kind: "invite", email } });
    const cookie = await signInAs(appUrl, email, "joiner-first-pass");
    expect(cookie).toContain("next-auth.session-token=");
    expect((await call("GET", "/api/me", { cookie })).body.user).toMatchObject({ email, role: "operator", state: "active" });

    const again = await call("POST", `/api/auth-links/${token}`, { body: { password: "joiner-other-pass" } });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe("gone:auth-links");
    expect(again.body.error.message).toMatch(/already been used/);
    expect(await call("GET", `/api/auth-links/${token}`)).toEqual({ status: 200, body: { state: "used" } });
    expect((await call("POST", `/api/auth-links/${"z".repeat(43)}`, { body: { password: "whatever-pass" } })).status).toBe(404);
  });

  it("refuses bad input with 400 and the fields at fault, and a second invite to one address with 409", async () => {
    const bad = await call("POST", "/api/users", { cookie: admin, body: { email: "not-an-address", name: " ", role: "captain" } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe("bad_request:users");
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["email", "name", "role"]);
    expect((await call("POST", "/api/users", { cookie: admin, body: "{not json" })).body.error.message).toBe("The request body is not valid JSON.");

    const email = address("twice");
    expect((await call("POST", "/api/users", { cookie: admin, body: { email, name: "Once", role: "viewer" } })).status).toBe(201);
    const twice = await call("POST", "/api/users", { cookie: admin, body: { email: email.toUpperCase(), name: "Twice", role: "admin" } });
    expect(twice).toMatchObject({ status: 409, body: { error: { code: "conflict:users", message: `${email} is already on the crew.` } } });
    expect((await crew()).filter((m) => m.email === email).map((m) => [m.name, m.role])).toEqual([["Once", "viewer"]]);

    expect((await call("PATCH", "/api/users/abc", { cookie: admin, body: { role: "viewer" } })).body.error.message).toBe('User id "abc" is not a positive integer.');
    expect((await call("PATCH", "/api/users/987654321", { cookie: admin, body: { role: "viewer" } })).status).toBe(404);
    expect((await call("PATCH", "/api/users/1", { cookie: admin, body: {} })).status).toBe(400);
    expect((await call("PATCH", "/api/users/1", { cookie: admin, body: { role: "viewer", passwordHash: "x" } })).status).toBe(400);
  });
});

describe("roles and deactivation", () => {
  it("refuses to demote or deactivate the last active admin with 409 and a clear message", async () => {
    const members = await crew();
    expect(members.filter((m) => m.role === "admin" && m.state !== "deactivated").map((m) => m.email)).toEqual(["admin@tessera.test"]);
    const me = members.find((m) => m.email === "admin@tessera.test")!;
    const demote = await call("PATCH", `/api/users/${me.id}`, { cookie: admin, body: { role: "viewer" } });
    expect(demote).toEqual({
      status: 409,
      body: { error: { code: "conflict:users", message: "Ada Okafor is the last active admin and cannot be made viewer; make another user admin first." } },
    });
    const off = await call("PATCH", `/api/users/${me.id}`, { cookie: admin, body: { disabled: true } });
    expect(off.status).toBe(409);
    expect(off.body.error.message).toMatch(/cannot be deactivated/);
    expect((await call("GET", "/api/me", { cookie: admin })).body.user).toMatchObject({ role: "admin", state: "active" });
  });

  it("applies a role change and a deactivation on the user's next request", async () => {
    const user = await newcomer("shifted", "viewer");
    expect((await call("GET", "/api/users", { cookie: user.cookie })).body.error.message).toBe("This needs the admin role; you are viewer.");
    expect((await call("PATCH", `/api/users/${user.id}`, { cookie: admin, body: { role: "operator", onCall: true } })).body.user).toMatchObject({ role: "operator", onCall: true });
    expect((await call("GET", "/api/users", { cookie: user.cookie })).body.error.message).toBe("This needs the admin role; you are operator.");

    expect((await call("PATCH", `/api/users/${user.id}`, { cookie: admin, body: { disabled: true } })).body.user).toMatchObject({ state: "deactivated" });
    expect((await call("GET", "/api/me", { cookie: user.cookie })).status).toBe(401);
    expect(await signInAs(appUrl, user.email, "newcomer-password")).not.toContain("next-auth.session-token=");
    const page = await fetch(`${appUrl}/floor`, { headers: { cookie: user.cookie }, redirect: "manual" });
    expect(page.status).toBe(307);
    expect(page.headers.get("location")).toContain("/sign-in");

    expect((await call("PATCH", `/api/users/${user.id}`, { cookie: admin, body: { disabled: false } })).body.user).toMatchObject({ state: "active" });
    expect(await signInAs(appUrl, user.email, "newcomer-password")).toContain("next-auth.session-token=");
  });
});

describe("passwords", () => {
  it("answers a reset request with the same 202 whether or not the address has an account", async () => {
    const known = await call("POST", "/api/auth-links/reset-request", { body: { email: "viewer@tessera.test" } });
    const unknown = await call("POST", "/api/auth-links/reset-request", { body: { email: address("no-such-user") } });
    expect(known.status).toBe(202);
    expect(unknown).toEqual(known);
    expect((await call("POST", "/api/auth-links/reset-request", { body: { email: "nope" } })).status).toBe(400);
  });

  it("sends an admin's reset link that replaces the old password", async () => {
    const user = await newcomer("resettable", "viewer", "before-reset-pass");
    expect(await call("POST", `/api/users/${user.id}/reset`, { cookie: admin })).toEqual({ status: 202, body: { kind: "reset", email: user.email } });
    const token = await mailedToken(user.email, "reset");
    expect((await call("POST", `/api/auth-links/${token}`, { body: { password: "after-reset-pass" } })).status).toBe(200);
    expect(await signInAs(appUrl, user.email, "before-reset-pass")).not.toContain("next-auth.session-token=");
    expect(await signInAs(appUrl, user.email, "after-reset-pass")).toContain("next-auth.session-token=");
  });

  it("changes the own name, and the own password only with the current one", async () => {
    const user = await newcomer("selfserve", "operator", "self-serve-pass-1");
    const wrong = await call("PATCH", "/api/me", { cookie: user.cookie, body: { currentPassword: "nope", newPassword: "self-serve-pass-2" } });
    expect(wrong).toEqual({
      status: 400,
      body: { error: { code: "bad_request:me", message: "The current password is not right; your password is unchanged.", fields: { currentPassword: ["This is not your current password."] } } },
    });
    expect((await call("PATCH", "/api/me", { cookie: user.cookie, body: { newPassword: "self-serve-pass-2" } })).body.error.fields).toEqual({ currentPassword: ["Enter your current password to change it."] });
    const done = await call("PATCH", "/api/me", { cookie: user.cookie, body: { name: "Sol Serve", currentPassword: "self-serve-pass-1", newPassword: "self-serve-pass-2" } });
    expect(done.body.user).toMatchObject({ name: "Sol Serve", role: "operator" });
    expect(await signInAs(appUrl, user.email, "self-serve-pass-2")).toContain("next-auth.session-token=");
  });
});

describe("audit", () => {
  it("lists who did what with filters and server-side paging", async () => {
    const user = await newcomer("traced", "viewer");
    await call("PATCH", `/api/users/${user.id}`, { cookie: admin, body: { role: "operator" } });
    const adminId = (await crew()).find((m) => m.email === "admin@tessera.test")!.id;
    const byAdmin = await call("GET", `/api/audit?user=${adminId}&limit=200`, { cookie: admin });
    const about = (byAdmin.body.items as AuditItem[]).filter((i) => i.target === user.email).map((i) => [i.action, i.userName, i.detail]);
    expect(about).toEqual([
      ["role-change", "Ada Okafor", { userId: user.id, from: "viewer", to: "operator" }],
      ["invite", "Ada Okafor", { userId: user.id, role: "viewer" }],
    ]);
    const invites = await call("GET", "/api/audit?action=invite&limit=1", { cookie: admin });
    const second = await call("GET", "/api/audit?action=invite&limit=1&page=2", { cookie: admin });
    expect(invites.body.total).toBeGreaterThanOrEqual(2);
    expect(second.body.total).toBe(invites.body.total);
    expect(invites.body.items).toHaveLength(1);
    expect((second.body.items as AuditItem[])[0].at).toBeLessThanOrEqual((invites.body.items as AuditItem[])[0].at);
    const bad = await call("GET", "/api/audit?from=someday&limit=0", { cookie: admin });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["from", "limit"]);
  });
});
