/**
 * Reports against the running server (issue 7, part 6): the shift summary's routes with
 * their roles and errors, the CSV download, the digest refusing until e-mail is set up,
 * and the page in a browser.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { users } from "../../db/schema";
import { ShiftSummarySchema } from "../../lib/protocol/reports";
import { SHIFT_CSV_COLUMNS } from "../../lib/reports/shift-csv";
import { ROOT } from "../../scripts/local-env";
import { withBrowser } from "../support/browser";
import { seedFloorplan, seedMissions, seedRobots } from "../support/report-seed";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const shots = path.join(ROOT, "test-results", "reports");
let db: Db;
let viewer = "";
let operator = "";
let floorplanId = 0;
let floorplanName = "";
const now = Date.now();

beforeAll(async () => {
  mkdirSync(shots, { recursive: true });
  db = openDb(inject("databaseUrl"));
  floorplanName = `Report e2e bay ${now % 1_000_000}`;
  const plan = await seedFloorplan(db, floorplanName);
  floorplanId = plan.floorplanId;
  const [wren, heron] = await seedRobots(db, floorplanId, ["Wren", "Heron"]);
  const minutesAgo = (m: number) => now - m * 60_000;
  await seedMissions(db, [
    { robotId: wren, versionId: plan.versionId, state: "reached", startedAt: minutesAgo(300), endedAt: minutesAgo(296), minCertainty: 0.62, holds: ["low_certainty"] },
    { robotId: wren, versionId: plan.versionId, state: "reached", startedAt: minutesAgo(200), endedAt: minutesAgo(198), minCertainty: 0.81 },
    { robotId: wren, versionId: plan.versionId, state: "failed", startedAt: minutesAgo(120), endedAt: minutesAgo(100), minCertainty: 0.18, holds: ["low_certainty", "operator"] },
    { robotId: heron, versionId: plan.versionId, state: "reached", startedAt: minutesAgo(90), endedAt: minutesAgo(84), minCertainty: 0.74, holds: ["traffic"] },
    { robotId: heron, versionId: plan.versionId, state: "aborted", startedAt: minutesAgo(40), endedAt: minutesAgo(39), minCertainty: 0.55 },
    // A day ago: outside the default shift.
    { robotId: heron, versionId: plan.versionId, state: "reached", startedAt: now - 86_400_000, endedAt: now - 86_400_000 + 60_000, minCertainty: 0.9 },
  ]);
  viewer = await signInAs(appUrl, "viewer@tessera.test");
  operator = await signInAs(appUrl, "operator@tessera.test");
});

afterAll(async () => {
  await db.update(users).set({ onCall: false }).where(eq(users.email, "viewer@tessera.test"));
  await closeDb();
});

async function get(pathAndQuery: string, cookie = viewer) {
  return fetch(`${appUrl}${pathAndQuery}`, { headers: { cookie } });
}

describe("shift summary routes", () => {
  it("answers the last shift of one floorplan as JSON, for a viewer", async () => {
    const res = await get(`/api/reports/shift?floorplan=${floorplanId}`);
    expect(res.status).toBe(200);
    const summary = ShiftSummarySchema.parse(await res.json());
    expect(summary.to - summary.from).toBe(8 * 3600_000);
    expect(summary.totals).toMatchObject({ started: 5, reached: 3, aborted: 1, failed: 1, active: 0, medianReachS: 240, certaintyMin: 0.18, holds: { low_certainty: 2, operator: 1, traffic: 1, offline: 0, fault: 0 } });
    expect(summary.totals.underWayS).toBeCloseTo((4 + 2 + 20 + 6 + 1) * 60, 3);
    expect(summary.robots.map((r) => [r.robotName, r.started, r.medianReachS])).toEqual([
      ["Heron", 2, 360],
      ["Wren", 3, 180],
    ]);
  });

  it("downloads the same summary as a CSV attachment", async () => {
    const from = now - 8 * 3600_000;
    const res = await get(`/api/reports/shift?floorplan=${floorplanId}&from=${new Date(from).toISOString()}&to=${now}&format=csv`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="tessera-shift-\d{8}T?\d{4}-\d{8}T?\d{4}\.csv"$/);
    const lines = (await res.text()).trimEnd().split("\r\n");
    expect(lines[0]).toBe(SHIFT_CSV_COLUMNS.join(","));
    expect(lines.slice(1).map((l) => l.split(",").slice(1, 4))).toEqual([
      ["Heron", "2", "1"],
      ["Wren", "3", "2"],
      ["All robots", "5", "3"],
    ]);
  });

  it("refuses bad input with 400 and says what is wrong where", async () => {
    const garbled = await get("/api/reports/shift?from=last-tuesday");
    expect(garbled.status).toBe(400);
    expect(await garbled.json()).toMatchObject({ error: { code: "bad_request:reports", fields: { from: [expect.stringContaining("neither an ISO date-time")] } } });
    const long = await get("/api/reports/shift?from=2026-01-01T00:00:00Z&to=2026-03-01T00:00:00Z");
    expect(long.status).toBe(400);
    expect(await long.json()).toMatchObject({ error: { fields: { to: ["the range spans 59.0 days; at most 31 are allowed"] } } });
    expect((await get("/api/reports/shift?format=pdf")).status).toBe(400);
    const unknown = await get("/api/reports/shift?floorplan=987654");
    expect(unknown.status).toBe(404);
    expect(await unknown.json()).toMatchObject({ error: { code: "not_found:reports", message: "Floorplan 987654 does not exist." } });
    expect((await fetch(`${appUrl}/api/reports/shift`)).status).toBe(401);
  });

  it("sends the digest only for operators, and to every on-call user through the mail catcher", async () => {
    const post = (cookie: string, body: unknown) =>
      fetch(`${appUrl}/api/reports/shift/digest`, { method: "POST", headers: { cookie, "content-type": "application/json" }, body: JSON.stringify(body) });
    expect((await post(viewer, {})).status).toBe(403);
    // Other suites may have left someone on call; this test sets the list it needs.
    await db.update(users).set({ onCall: false });
    const nobody = await post(operator, { floorplan: floorplanId });
    expect(nobody.status).toBe(422);
    expect(await nobody.json()).toMatchObject({ error: { code: "unprocessable:digest", message: expect.stringContaining("on-call list") } });
    await db.update(users).set({ onCall: true }).where(eq(users.email, "viewer@tessera.test"));
    const sent = await post(operator, { floorplan: floorplanId });
    expect(sent.status).toBe(200);
    const answer = (await sent.json()) as { to: string[]; subject: string };
    expect(answer.to).toEqual(["viewer@tessera.test"]);
    const admin = await signInAs(appUrl, "admin@tessera.test");
    await expect
      .poll(async () => {
        const mail = (await (await fetch(`${appUrl}/api/mail?limit=100`, { headers: { cookie: admin } })).json()) as { items: { to: string[]; subject: string; text: string }[] };
        return mail.items.filter((m) => m.subject === answer.subject && m.to.includes("viewer@tessera.test")).length;
      }, { timeout: 10_000 })
      .toBe(1);
    const bad = await post(operator, { from: "soon" });
    expect(bad.status).toBe(400);
  });
});

describe("reports page", () => {
  it("shows figures, charts and the per-robot table for a floorplan, and the digest button to operators only", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await page.setViewportSize({ width: 1440, height: 1000 });
      await page.goto(`${appUrl}/reports`);
      await page.getByLabel("E-mail").fill("operator@tessera.test");
      await page.getByLabel("Password").fill("demo-tessera");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(/\/reports/);
      await page.getByLabel("Floorplan").selectOption({ label: floorplanName });
      const table = page.getByRole("table", { name: "Per robot" });
      await expect.poll(() => table.getByRole("row").count()).toBe(3);
      const figures = page.getByLabel("Headline figures");
      await expect.poll(() => figures.innerText()).toContain("Missions started\n5");
      expect(await figures.innerText()).toContain("Median time to reach\n4 min 00 s");
      expect(await page.getByRole("img", { name: /^Missions by outcome: Reached 3, Aborted 1, Failed 1, Under way 0$/ }).count()).toBe(1);
      expect(await page.getByRole("img", { name: /^Holds by reason: Low certainty 2, Operator 1, Link lost 0, Traffic 1, Fault 0$/ }).count()).toBe(1);
      await expect.poll(() => page.locator('figure[aria-label="Missions by outcome"] svg rect').count()).toBeGreaterThanOrEqual(3);
      expect(await page.getByRole("button", { name: "Last 8 h" }).getAttribute("aria-pressed")).toBe("true");
      const csv = page.getByRole("link", { name: "Download CSV" });
      expect(await csv.getAttribute("href")).toContain(`floorplan=${floorplanId}`);
      // Counts sort largest first on the first click, smallest first on the second.
      await table.getByRole("button", { name: "Started" }).click();
      await expect.poll(() => table.getByRole("row").nth(1).innerText()).toMatch(/^Wren\t3\t2\t0\t1\t0\t26 min 00 s\t3 min 00 s\t18 %\t54 %\t3$/);
      await table.getByRole("button", { name: /Started/ }).click();
      await expect.poll(() => table.getByRole("row").nth(1).innerText()).toMatch(/^Heron/);
      await page.screenshot({ path: path.join(shots, "reports-dark.png"), fullPage: true });
      await page.getByRole("button", { name: "Send digest now" }).click();
      await expect.poll(() => page.getByRole("status").innerText(), { timeout: 10_000 }).toMatch(/Digest sent to 1 on call|on-call list/);
      await page.getByRole("button", { name: "Last 7 days" }).click();
      await expect.poll(() => figures.innerText()).toContain("Missions started\n6");
      await page.evaluate(() => document.documentElement.classList.remove("dark"));
      await page.screenshot({ path: path.join(shots, "reports-light.png"), fullPage: true });
    });
  });

  it("offers viewers the figures and the CSV but no digest", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await page.goto(`${appUrl}/reports`);
      await page.getByLabel("E-mail").fill("viewer@tessera.test");
      await page.getByLabel("Password").fill("demo-tessera");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(/\/reports/);
      await expect.poll(() => page.getByLabel("Headline figures").count()).toBe(1);
      expect(await page.getByRole("link", { name: "Download CSV" }).count()).toBe(1);
      expect(await page.getByRole("button", { name: "Send digest now" }).count()).toBe(0);
    });
  });
});
