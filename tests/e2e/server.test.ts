/** The running server's public doors: health, the sign-in endpoints scripts use, /robot refusal. */
import { io as connect } from "socket.io-client";
import { afterAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb } from "../../db/client";
import { withBrowser } from "../support/browser";
import { insertTestRobot } from "../support/robot-fixtures";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");

afterAll(async () => {
  await closeDb();
});

function connectError(namespace: string, opts: { auth?: Record<string, unknown>; extraHeaders?: Record<string, string> }): Promise<unknown> {
  return new Promise((resolve) => {
    const socket = connect(`${appUrl}${namespace}`, { ...opts, reconnection: false, transports: ["websocket"] });
    socket.on("connect", () => {
      socket.close();
      resolve("connected");
    });
    socket.on("connect_error", (err) => {
      socket.close();
      resolve((err as Error & { data?: unknown }).data);
    });
  });
}

describe("server", () => {
  it("reports the database up on GET /api/health", async () => {
    const res = await fetch(`${appUrl}/api/health`);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true, db: true, version: expect.stringMatching(/^\d+\.\d+\.\d+$/) });
  });

  it("signs a script in through next-auth's csrf and credentials endpoints", async () => {
    const cookie = await signInAs(appUrl, "admin@tessera.test");
    expect(cookie).toMatch(/next-auth\.session-token=/);
    const me = await fetch(`${appUrl}/api/auth/session`, { headers: { cookie } });
    expect(await me.json()).toMatchObject({ user: { email: "admin@tessera.test", role: "admin" } });
  });

  it("answers a dispatch to a blocked tile with 422 and the reason, and a viewer's with 403", async () => {
    const dispatch = (cookie: string) =>
      fetch(`${appUrl}/api/missions`, {
        method: "POST",
        headers: { "content-type": "application/json", cookie },
        body: JSON.stringify({ robotId: "nx-kestrel", goal: { row: 0, col: 0 } }),
      });
    const refused = await dispatch(await signInAs(appUrl, "operator@tessera.test"));
    expect(refused.status).toBe(422);
    expect(await refused.json()).toEqual({ error: { code: "unprocessable:dispatch", message: "Goal tile (0, 0) is blocked." } });
    const viewer = await dispatch(await signInAs(appUrl, "viewer@tessera.test"));
    expect(viewer.status).toBe(403);
  });

  it("refuses a registered robot presenting a wrong key with connect_error bad_key", async () => {
    const robot = await insertTestRobot(openDb(inject("databaseUrl")));
    expect(await connectError("/robot", { auth: { robot: robot.id, key: "tsk_wrong" } })).toEqual({ code: "bad_key" });
  });

  it("serves pages and routes with a content security policy and the other security headers", async () => {
    for (const path of ["/sign-in", "/api/health"]) {
      const res = await fetch(`${appUrl}${path}`);
      const csp = res.headers.get("content-security-policy") ?? "";
      expect(csp, path).toContain("default-src 'self'");
      expect(csp, path).toContain("frame-ancestors 'none'");
      expect(csp, path).not.toContain("unsafe-eval");
      expect(res.headers.get("x-content-type-options"), path).toBe("nosniff");
      expect(res.headers.get("x-frame-options"), path).toBe("DENY");
    }
  });

  it("runs the sign-in page and the live floor with no content security policy violation", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await page.addInitScript(() => {
        const w = window as unknown as { violations: string[] };
        w.violations = [];
        document.addEventListener("securitypolicyviolation", (e) => w.violations.push(`${e.violatedDirective} ${e.blockedURI}`));
      });
      await page.goto(`${appUrl}/floor`);
      await page.getByLabel("E-mail").fill("operator@tessera.test");
      await page.getByLabel("Password").fill("demo-tessera");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(/\/floor/);
      await page.locator('[data-testid="connection-state"][data-connection="live"]').waitFor({ timeout: 20_000 });
      expect(await page.evaluate(() => (window as unknown as { violations: string[] }).violations)).toEqual([]);
    });
  });

  it("refuses a dashboard socket without a session", async () => {
    expect(await connectError("/ops", {})).toEqual({ code: "unauthorized" });
  });
});
