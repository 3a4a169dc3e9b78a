/**
 * The logbook's routes against the running server (issue 7): a mission run over the real
 * link, then listed with filters, paged through, exported as CSV and JSON, and replayed.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import { io as connect, type Socket } from "socket.io-client";
import { Jimp } from "jimp";
import { PNG } from "pngjs";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_SENSORS } from "../../db/seed";
import type { ServerMessage } from "../../lib/protocol";
import { ROOT } from "../../scripts/local-env";
import { signInAs } from "../../scripts/sign-in";
import { withBrowser } from "../support/browser";

const appUrl = inject("appUrl");
let viewer = "";
let operatorCookie = "";
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
  operatorCookie = operator;
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

/** A small PNG of solid colour, encoded by pngjs. */
function png(width: number, height: number): Buffer {
  const image = new PNG({ width, height });
  image.data.fill(0x80);
  return PNG.sync.write(image);
}

async function postNote(fields: Record<string, string>, photos: { name: string; type: string; bytes: Buffer }[] = [], cookie = operatorCookie) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  for (const p of photos) form.append("photo", new Blob([new Uint8Array(p.bytes)], { type: p.type }), p.name);
  const res = await fetch(`${appUrl}/api/missions/${missionId}/notes`, { method: "POST", body: form, headers: { cookie } });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

describe("mission notes and photos", () => {
  it("stores a note pinned to a step with a PNG and a JPEG, each with a thumbnail", async () => {
    const jpeg = await new Jimp({ width: 800, height: 600, color: 0x3366ccff }).getBuffer("image/jpeg");
    const made = await postNote({ text: "Left wheel squeaks near the dock", step: "4" }, [
      { name: "dock.png", type: "image/png", bytes: png(40, 30) },
      { name: "wheel.jpg", type: "image/jpeg", bytes: jpeg },
    ]);
    expect(made.status).toBe(201);
    const note = made.body.note as { id: number; step: number; author: string; photos: { id: number; mime: string; width: number; height: number }[] };
    expect(note).toMatchObject({ step: 4, author: "Tomás Reyes", text: "Left wheel squeaks near the dock" });
    expect(note.photos.map((p) => [p.mime, p.width, p.height])).toEqual([
      ["image/png", 40, 30],
      ["image/jpeg", 800, 600],
    ]);
    const listed = await getJson(`/api/missions/${missionId}/notes`);
    expect((listed.body.items as { id: number }[]).map((n) => n.id)).toContain(note.id);
    const full = await fetch(`${appUrl}/api/missions/${missionId}/photos/${note.photos[1].id}`, { headers: { cookie: viewer } });
    expect(full.headers.get("content-type")).toBe("image/jpeg");
    expect(Buffer.from(await full.arrayBuffer()).equals(jpeg)).toBe(true);
    const thumb = await fetch(`${appUrl}/api/missions/${missionId}/photos/${note.photos[1].id}?size=thumb`, { headers: { cookie: viewer } });
    const small = await Jimp.read(Buffer.from(await thumb.arrayBuffer()));
    expect([small.width, small.height]).toEqual([240, 180]);
  });

  it("refuses photos that are not what they claim, too large or too many pixels, and stores nothing of that note", async () => {
    const before = ((await getJson(`/api/missions/${missionId}/notes`)).body.items as unknown[]).length;
    const text = await postNote({ text: "not a photo" }, [{ name: "plan.png", type: "image/png", bytes: Buffer.from("just some text, not an image at all") }]);
    expect(text.status).toBe(415);
    expect(text.body).toMatchObject({ error: { code: "unsupported:notes", message: expect.stringContaining('"plan.png"') } });
    const gif = await postNote({ text: "a gif" }, [{ name: "a.gif", type: "image/gif", bytes: Buffer.from("GIF89a\x01\x00\x01\x00\x80\x00\x00", "latin1") }]);
    expect(gif.status).toBe(415);
    // A real PNG whose header is edited to claim 100 000 × 100 000 pixels: refused before decoding.
    const huge = png(8, 8);
    huge.writeUInt32BE(100_000, 16);
    huge.writeUInt32BE(100_000, 20);
    const bomb = await postNote({ text: "huge" }, [{ name: "huge.png", type: "image/png", bytes: huge }]);
    expect(bomb.status).toBe(422);
    expect(bomb.body).toMatchObject({ error: { message: expect.stringContaining("100000 × 100000") } });
    const big = await postNote({ text: "big" }, [{ name: "big.jpg", type: "image/jpeg", bytes: Buffer.alloc(9 * 1024 * 1024, 0xff) }]);
    expect(big.status).toBe(413);
    const empty = await postNote({ text: "   " });
    expect(empty.status).toBe(400);
    expect(empty.body).toMatchObject({ error: { code: "bad_request:notes", fields: { text: expect.any(Array) } } });
    const json = await fetch(`${appUrl}/api/missions/${missionId}/notes`, { method: "POST", headers: { cookie: operatorCookie, "content-type": "application/json" }, body: "{}" });
    expect(json.status).toBe(415);
    expect(((await getJson(`/api/missions/${missionId}/notes`)).body.items as unknown[]).length).toBe(before);
  });

  it("lets viewers read notes but not write them", async () => {
    const refused = await postNote({ text: "viewer note" }, [], viewer);
    expect(refused.status).toBe(403);
    expect(refused.body).toMatchObject({ error: { code: "forbidden:notes" } });
    expect((await fetch(`${appUrl}/api/missions/${missionId}/notes`)).status).toBe(401);
  });
});

describe("certainty curve and what-if", () => {
  it("answers the live curve and, for other parameters, a second curve beside it", async () => {
    const live = await getJson(`/api/missions/${missionId}/certainty`);
    expect(live.status).toBe(200);
    const points = live.body.points as { step: number; tileMass: number }[];
    expect(points.map((p) => p.step)).toEqual([0, 1, 2, 3, 4, 5, 6]);
    expect(points[0].tileMass).toBe(1);
    const res = await fetch(`${appUrl}/api/missions/${missionId}/certainty`, {
      method: "POST",
      headers: { cookie: viewer, "content-type": "application/json" },
      body: JSON.stringify({ motion: { forward: { ok: 0.4, stall: 0.3, over: 0.3 } } }),
    });
    const both = (await res.json()) as { baseline: { points: typeof points }; whatIf: { points: typeof points } };
    expect(both.baseline.points).toEqual(points);
    expect(Math.abs(both.whatIf.points[6].tileMass - points[6].tileMass)).toBeGreaterThan(0.01);
    const bad = await fetch(`${appUrl}/api/missions/${missionId}/certainty`, {
      method: "POST",
      headers: { cookie: viewer, "content-type": "application/json" },
      body: JSON.stringify({ sensor: { range: { sigmaM: -1 } } }),
    });
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({ error: { fields: { "sensor.range.sigmaM": expect.any(Array) } } });
  });

  it("shows the chart, runs a what-if and attaches a photo in the browser, and prints a summary", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await page.setViewportSize({ width: 1440, height: 1400 });
      await page.goto(`${appUrl}/logbook/${missionId}`);
      await page.getByLabel("E-mail").fill("operator@tessera.test");
      await page.getByLabel("Password").fill("demo-tessera");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(`${appUrl}/logbook/${missionId}`);
      const chart = page.getByTestId("certainty-chart");
      await chart.locator("path").first().waitFor();
      await page.getByText("What-if: replay these messages with other parameters").click();
      await page.getByLabel("Forward one tile").fill("0.4");
      await page.getByLabel("Forward stall").fill("0.3");
      await page.getByLabel("Forward overshoot").fill("0.3");
      await page.getByRole("button", { name: "Replay with these parameters" }).click();
      await expect.poll(() => chart.innerText(), { timeout: 15_000 }).toMatch(/what-if: \d+ of 7 steps under the hold threshold/);
      await page.getByLabel("Note text").fill("Checked the corridor; floor is clean");
      await page.getByLabel("Photos").setInputFiles({ name: "corridor.png", mimeType: "image/png", buffer: png(64, 48) });
      await page.getByRole("button", { name: "Add note" }).click();
      await expect.poll(() => page.getByTestId("mission-note").filter({ hasText: "floor is clean" }).count(), { timeout: 15_000 }).toBe(1);
      await page.getByTestId("mission-note").filter({ hasText: "floor is clean" }).getByRole("img").waitFor();
      expect(await page.getByTestId("timeline").innerText()).toMatch(/note\s+Checked the corridor; floor is clean \(1 photo\)/);
      await page.screenshot({ path: path.join(ROOT, "test-results", "logbook", "mission-chart-notes.png"), fullPage: true });
      await page.getByRole("link", { name: "Printable summary" }).click();
      await page.waitForURL(`${appUrl}/logbook/${missionId}/summary`);
      const summary = await page.getByTestId("mission-summary").innerText();
      expect(summary).toMatch(/Robot\s+Logbook probe/);
      expect(summary).toMatch(/Checked the corridor; floor is clean/);
      await page.emulateMedia({ media: "print" });
      expect(await page.getByRole("button", { name: "Print" }).isVisible()).toBe(false);
      await page.screenshot({ path: path.join(ROOT, "test-results", "logbook", "mission-summary-print.png"), fullPage: true });
    });
  });
});
