/**
 * The logbook's routes against the running server (issue 7): a mission run over the real
 * link, then listed with filters, paged through, exported as CSV and JSON, and replayed.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import { io as connect, type Socket } from "socket.io-client";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_SENSORS } from "../../db/seed";
import type { ServerMessage } from "../../lib/protocol";
import { ROOT } from "../../scripts/local-env";
import { signInAs } from "../support/session";
import { withBrowser } from "../support/browser";

const appUrl = inject("appUrl");
let viewer = "";
let socket: Socket;
let robotId = "";
let missionId = 0;

const readings = [
  { sensor: "us-front", rangeM: 1.5 },
  { sensor: "us-left", rangeM: 0.46 },
  { sensor: "us-right", rangeM: 0.15 },
  { sensor: "floor", mark: 0 },
];

async function getJson(path: string, cookie = viewer) {
  const res = await fetch(`${appUrl}${path}`, { headers: { cookie } });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

async function until(ok: () => boolean, timeoutMs = 5000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!ok()) {
    if (Date.now() > deadline) throw new Error("the server sent no next step in time");
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

beforeAll(async () => {
  mkdirSync(path.join(ROOT, "test-results", "logbook"), { recursive: true });
  const admin = await signInAs(appUrl, "admin@tessera.test");
  const operator = await signInAs(appUrl, "operator@tessera.test");
  viewer = await signInAs(appUrl, "viewer@tessera.test");
  const res = await fetch(`${appUrl}/api/robots`, {
    method: "POST",
    headers: { "content-type": "application/json", cookie: admin },
    body: JSON.stringify({ name: "Logbook probe", drive: "differential", sensors: DEMO_SENSORS, simulated: true }),
  });
  const { robot, key } = (await res.json()) as { robot: { id: string }; key: string };
  robotId = robot.id;
  socket = connect(`${appUrl}/robot`, { auth: { robot: robot.id, key }, transports: ["websocket"] });
  let seq = 1;
  await socket.timeout(5000).emitWithAck("hello", { seq, at: Date.now(), protocol: 1, model: "probe", drive: "differential", sensors: DEMO_SENSORS });
  const nexts: ServerMessage["next"][] = [];
  socket.on("next", (m: ServerMessage["next"]) => nexts.push(m));
  const relocate = await fetch(`${appUrl}/api/robots/${robot.id}/relocate`, {
    method: "POST",
    headers: { "content-type": "application/json", cookie: operator },
    body: JSON.stringify({ row: 10, col: 16, heading: "W" }),
  });
  if (relocate.status !== 200) throw new Error(`relocate answered ${relocate.status}`);
  const dispatched = await fetch(`${appUrl}/api/missions`, {
    method: "POST",
    headers: { "content-type": "application/json", cookie: operator },
    body: JSON.stringify({ robotId: robot.id, goal: { row: 10, col: 4 } }),
  });
  if (dispatched.status !== 201) throw new Error(`dispatch answered ${dispatched.status}`);
  missionId = ((await dispatched.json()) as { mission: { id: number } }).mission.id;
  for (let step = 0; step < 3; step++) {
    await until(() => nexts.length > step);
    await socket.timeout(5000).emitWithAck("moved", { seq: ++seq, at: Date.now(), action: nexts[step].action });
    await socket.timeout(5000).emitWithAck("sensed", { seq: ++seq, at: Date.now(), readings });
  }
});

afterAll(() => {
  socket?.close();
});

describe("logbook routes", () => {
  it("lists missions with filters and server-side paging", async () => {
    const mine = await getJson(`/api/missions?robot=${robotId}`);
    expect(mine.status).toBe(200);
    expect(mine.body).toMatchObject({ total: 1, items: [{ id: missionId, robotId, robotName: "Logbook probe", goal: { row: 10, col: 4 }, state: "active" }] });
    const page = await getJson(`/api/missions?limit=1&page=1&outcome=active`);
    expect((page.body.items as unknown[]).length).toBe(1);
    expect(page.body.total).toBeGreaterThanOrEqual(1);
    const bad = await getJson(`/api/missions?outcome=lost`);
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ error: { code: "bad_request:missions", fields: { outcome: expect.any(Array) } } });
  });

  it("pages through a mission's events in the order they were applied", async () => {
    const first = await getJson(`/api/missions/${missionId}/events?limit=3`);
    const items = first.body.items as { id: number; kind: string }[];
    expect(items.map((e) => e.kind)).toEqual(["dispatch", "next", "moved"]);
    expect(first.body.next).toBe(items[2].id);
    const rest = await getJson(`/api/missions/${missionId}/events?after=${first.body.next}&limit=100`);
    const kinds = (rest.body.items as { kind: string }[]).map((e) => e.kind);
    expect(kinds.filter((k) => k === "sensed")).toHaveLength(3);
    expect(rest.body.next).toBeNull();
  });

  it("exports the events as CSV and as JSON", async () => {
    const csv = await fetch(`${appUrl}/api/missions/${missionId}/export?format=csv`, { headers: { cookie: viewer } });
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/);
    const lines = (await csv.text()).trim().split("\n");
    expect(lines[0]).toBe("id,seq,source,kind,robotAt,receivedAt,payload");
    const json = await fetch(`${appUrl}/api/missions/${missionId}/export?format=json`, { headers: { cookie: viewer } });
    const parsed = (await json.json()) as { kind: string }[];
    expect(parsed).toHaveLength(lines.length - 1);
    expect(parsed[0].kind).toBe("dispatch");
    expect((await fetch(`${appUrl}/api/missions/999999/export`, { headers: { cookie: viewer } })).status).toBe(404);
  });

  it("replays the belief at the start and after the last step", async () => {
    const start = await getJson(`/api/missions/${missionId}/replay?step=0`);
    expect(start.body).toMatchObject({ step: 0, steps: 6, estimate: { row: 10, col: 16, tileMass: 1 }, event: null });
    const last = await getJson(`/api/missions/${missionId}/replay`);
    expect(last.body).toMatchObject({ step: 6, steps: 6, event: { kind: "sensed" } });
    expect(Buffer.from((last.body.belief as { data: string }).data, "base64")).toHaveLength(20 * 30);
    expect((await getJson(`/api/missions/${missionId}/replay?step=7`)).status).toBe(400);
  });

  it("shows the mission in the logbook and scrubs its replay in the browser", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await page.setViewportSize({ width: 1440, height: 1000 });
      await page.goto(`${appUrl}/logbook?robot=${robotId}`);
      await page.getByLabel("E-mail").fill("viewer@tessera.test");
      await page.getByLabel("Password").fill("demo-tessera");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(/\/logbook/);
      expect(await page.getByTestId("mission-total").innerText()).toMatch(/^1 missions/);
      await page.getByRole("link", { name: `#${missionId}` }).click();
      await page.waitForURL(`${appUrl}/logbook/${missionId}`);
      const step = page.getByTestId("replay-step");
      await expect.poll(() => step.innerText()).toBe("update 6 / 6");
      await page.getByLabel("Replay step").fill("0");
      await expect.poll(() => page.getByTestId("replay-readout").innerText()).toMatch(/Start of the mission[\s\S]*\(10, 16\) facing W/);
      expect(await page.getByTestId("timeline").innerText()).toMatch(/dispatched by operator@tessera\.test/);
      await page.screenshot({ path: path.join(ROOT, "test-results", "logbook", "mission-replay.png") });
    });
  });
});
