/**
 * The live floor in a real browser against the real server: simulated robots from the
 * demo fleet connect over /robot as hardware would; an operator dispatches one by clicking
 * a tile, watches it arrive, holds and releases another; a viewer cannot command; and a
 * performance trace of the page under live belief frames has no main-thread task over 50 ms.
 * Screenshots go to test-results/live-floor/.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb } from "../../db/client";
import { seedDemoFleet, seedDemoFloorplan } from "../../db/seed";
import { ROOT } from "../../scripts/local-env";
import { withBrowser } from "../support/browser";
import { mainThreadTasks } from "../support/trace";

const appUrl = inject("appUrl");
const databaseUrl = inject("databaseUrl");
const SHOTS = path.join(ROOT, "test-results", "live-floor");
const DEMO_PASSWORD = "demo-tessera";

let fleetDir = "";
let simulators: ChildProcess | undefined;

beforeAll(async () => {
  mkdirSync(SHOTS, { recursive: true });
  const db = openDb(databaseUrl);
  const floorplanId = await seedDemoFloorplan(db);
  // Keys are stored hashed, so the simulators get fresh ones for this run.
  const fleet = await seedDemoFleet(db, floorplanId);
  await closeDb();
  fleetDir = mkdtempSync(path.join(tmpdir(), "tessera-floor-fleet-"));
  const fleetFile = path.join(fleetDir, "fleet.json");
  writeFileSync(fleetFile, JSON.stringify(fleet), { mode: 0o600 });
  simulators = spawn(process.execPath, ["--import", "tsx", "simulators/cli.ts", "--url", appUrl, "--fleet", fleetFile, "--floorplan", "demo", "--time-scale", "3"], {
    cwd: ROOT,
    stdio: ["pipe", "ignore", "inherit"],
  });
});

afterAll(async () => {
  if (simulators && simulators.exitCode === null) {
    simulators.kill("SIGTERM");
    await new Promise((resolve) => simulators?.once("exit", resolve));
  }
  if (fleetDir) rmSync(fleetDir, { recursive: true, force: true });
});

async function openFloor(context: BrowserContext, who: "operator" | "viewer"): Promise<Page> {
  const page = await context.newPage();
  await page.setViewportSize({ width: 1600, height: 1000 });
  await page.goto(`${appUrl}/floor`);
  await page.waitForURL(/\/sign-in/);
  await page.getByLabel("E-mail").fill(`${who}@tessera.test`);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${appUrl}/floor`);
  await page.locator('[data-testid="connection-state"][data-connection="live"]').waitFor({ timeout: 20_000 });
  // Every demo robot reports its first pose once its simulator has connected.
  await page.locator('[data-testid^="robot-marker-"]').nth(3).waitFor({ timeout: 30_000 });
  return page;
}

interface MarkerInfo {
  id: string;
  row: number;
  col: number;
}

async function markers(page: Page): Promise<MarkerInfo[]> {
  return page.locator('[data-testid^="robot-marker-"]').evaluateAll((els) =>
    els.map((el) => ({ id: (el.getAttribute("data-testid") ?? "").replace("robot-marker-", ""), row: Number(el.getAttribute("data-row")), col: Number(el.getAttribute("data-col")) })),
  );
}

/** Clicks the centre of tile (row, col) on the floor map. */
async function clickTile(page: Page, rows: number, cols: number, row: number, col: number): Promise<void> {
  const box = await page.getByTestId("floor-map").boundingBox();
  if (!box) throw new Error("the floor map is not on screen");
  await page.mouse.click(box.x + ((col + 0.5) / cols) * box.width, box.y + ((row + 0.5) / rows) * box.height);
}

/** A free tile two to four steps from (row, col) that no robot stands on, read from the page's own plan. */
async function nearbyFreeTile(page: Page, from: MarkerInfo, taken: MarkerInfo[]): Promise<{ row: number; col: number; rows: number; cols: number }> {
  const plan = await page.evaluate(() => {
    const label = document.querySelector('[data-testid="floor-map"]')?.getAttribute("aria-label") ?? "";
    const m = /(\d+) rows by (\d+) columns/.exec(label);
    return m ? { rows: Number(m[1]), cols: Number(m[2]) } : null;
  });
  if (!plan) throw new Error("the floor map does not state its size");
  const seen: string[] = [];
  for (const [dr, dc] of [[0, 3], [0, -3], [3, 0], [-3, 0], [0, 2], [0, -2], [2, 0], [-2, 0], [2, 2], [-2, -2], [2, -2], [-2, 2], [0, 1], [0, -1], [1, 0], [-1, 0], [1, 1], [-1, -1]]) {
    const row = from.row + dr;
    const col = from.col + dc;
    if (row < 0 || col < 0 || row >= plan.rows || col >= plan.cols || taken.some((t) => t.row === row && t.col === col)) continue;
    await page.mouse.move(0, 0);
    const box = await page.getByTestId("floor-map").boundingBox();
    await page.mouse.move(box!.x + ((col + 0.5) / plan.cols) * box!.width, box!.y + ((row + 0.5) / plan.rows) * box!.height);
    const readout = page.getByTestId("hover-readout");
    const kind = (await readout.getAttribute("data-kind")) ?? "";
    seen.push(`${await readout.innerText()} [${kind}]`);
    if (["free", "mark", "dock"].includes(kind)) return { row, col, ...plan };
  }
  throw new Error(`no free tile near (${from.row}, ${from.col}); read ${seen.join(" | ")}`);
}

describe("live floor", () => {
  it("lets an operator dispatch a robot by clicking a tile and watch it arrive", async () => {
    await withBrowser(async (context) => {
      const page = await openFloor(context, "operator");
      await page.screenshot({ path: path.join(SHOTS, "operator-first-view.png") });
      const all = await markers(page);
      const robot = all[0];
      await page.getByTestId(`fleet-card-${robot.id}`).click();
      const goal = await nearbyFreeTile(page, robot, all);
      await clickTile(page, goal.rows, goal.cols, goal.row, goal.col);
      const dialog = page.getByTestId("confirm-dialog");
      await dialog.getByRole("heading", { name: new RegExp(`to tile \\(${goal.row}, ${goal.col}\\)`) }).waitFor();
      const caution = await dialog.getByRole("note", { name: "Safety caution" }).innerText();
      expect(caution).toMatch(/Keep people clear of robot paths/);
      expect(caution).toMatch(/emergency stop within reach/);
      expect(caution).toMatch(/not a safety-rated stop/);
      expect(caution).toMatch(/competent person/);
      await page.screenshot({ path: path.join(SHOTS, "operator-dispatch-confirm.png") });
      await dialog.getByRole("button", { name: "Send robot" }).click();
      const mission = page.getByTestId("robot-card-mission");
      await expect.poll(() => mission.innerText(), { timeout: 10_000 }).toMatch(new RegExp(`\\(${goal.row}, ${goal.col}\\)`));
      await page.getByTestId("selected-goal").first().waitFor();
      await page.screenshot({ path: path.join(SHOTS, "operator-mission-under-way.png") });
      await expect
        .poll(async () => (await page.getByTestId("robot-card").getByTestId("state-pill").innerText()).trim(), { timeout: 45_000, interval: 500 })
        .toBe("Arrived");
      const marker = page.getByTestId(`robot-marker-${robot.id}`);
      expect([Number(await marker.getAttribute("data-row")), Number(await marker.getAttribute("data-col"))]).toEqual([goal.row, goal.col]);
      await page.screenshot({ path: path.join(SHOTS, "operator-arrived.png") });
    });
  });

  it("refuses a blocked goal with the reason, not a silent no-op", async () => {
    await withBrowser(async (context) => {
      const page = await openFloor(context, "operator");
      await page.getByTestId("robot-card").waitFor();
      // Tile (0, 0) is the outer wall of the demo floor.
      await page.locator("#goal-row").fill("0");
      await page.getByRole("textbox", { name: "Column" }).fill("0");
      await page.getByRole("button", { name: "Send…" }).click();
      const notice = page.getByTestId("floor-notice");
      await notice.waitFor();
      expect(await notice.innerText()).toMatch(/Goal tile \(0, 0\) is blocked/);
    });
  });

  it("holds and releases a robot from the keyboard, with the caution on release", async () => {
    await withBrowser(async (context) => {
      const page = await openFloor(context, "operator");
      const all = await markers(page);
      const robot = all[all.length - 1];
      await page.getByTestId(`fleet-card-${robot.id}`).click();
      const pill = page.getByTestId("robot-card").getByTestId("state-pill");
      await page.keyboard.press("h");
      await expect.poll(() => pill.innerText(), { timeout: 10_000 }).toMatch(/Held · by an operator/);
      await page.screenshot({ path: path.join(SHOTS, "operator-held.png") });
      await page.keyboard.press("r");
      const dialog = page.getByTestId("confirm-dialog");
      await dialog.getByRole("note", { name: "Safety caution" }).waitFor();
      await dialog.getByRole("button", { name: "Release robot" }).click();
      await expect.poll(() => pill.innerText(), { timeout: 10_000 }).not.toMatch(/Held/);
    });
  });

  it("shows a viewer everything but no commands", async () => {
    await withBrowser(async (context) => {
      const page = await openFloor(context, "viewer");
      await page.getByTestId("robot-card").waitFor();
      expect(await page.getByRole("button", { name: /^Hold/ }).count()).toBe(0);
      expect(await page.getByRole("button", { name: /Release/ }).count()).toBe(0);
      expect(await page.getByRole("button", { name: "Send…" }).count()).toBe(0);
      expect(await page.getByTestId("robot-card").innerText()).toMatch(/Watching only/);
      const all = await markers(page);
      const goal = await nearbyFreeTile(page, all[0], all);
      await clickTile(page, goal.rows, goal.cols, goal.row, goal.col);
      await page.keyboard.press("h");
      await page.waitForTimeout(500);
      expect(await page.getByTestId("confirm-dialog").isVisible()).toBe(false);
      expect(await page.getByTestId("robot-card").getByTestId("state-pill").innerText()).not.toMatch(/Held · by an operator/);
      await page.screenshot({ path: path.join(SHOTS, "viewer.png") });
    });
  });

  it("keeps every main-thread task under 50 ms while belief frames stream in (all robots blended)", async () => {
    await withBrowser(async (context) => {
      const page = await openFloor(context, "operator");
      await page.getByRole("radio", { name: "All robots" }).click();
      const tasks = await mainThreadTasks(context, page, 8000);
      await page.screenshot({ path: path.join(SHOTS, "operator-all-beliefs.png") });
      expect(tasks.length).toBeGreaterThan(100);
      // Thread time, for the reason given in live-floor-load.test.ts.
      expect(Math.max(...tasks.map((t) => t.threadMs))).toBeLessThan(50);
    });
  });
});
