/**
 * The roster's route handlers against the real MariaDB and the real fleet service and
 * robot link: each action for each role, the key shown once, key rotation and retirement
 * cutting off a live robot, settings validation and reset, and `tune` reaching a robot.
 * The session is the only stand-in: next-auth's getServerSession answers with the demo
 * account the test names, as a signed-in browser's JWT would (tests/e2e/roster-api.test.ts
 * signs in for real).
 */
import { and, eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { audit, missions, robots, users } from "../../db/schema";
import { createFilter } from "../../lib/belief";
import { TuneSchema, type ServerMessage } from "../../lib/protocol";
import { defaultRobotSettings, motionModelOf, type RobotSettings } from "../../lib/roster";
import type { Role } from "../../lib/vocabulary";
import { replayMission } from "../../server/fleet/replay";
import { registry } from "../../server/registry";
import { connectRobot, helloPayload, startTestServer, TEST_SENSORS, tryRobotHandshake, type TestServer } from "../support/fleet-server";

const signedIn = vi.hoisted(() => ({ user: null as null | { id: string; email: string; name: string; role: string } }));
vi.mock("next-auth", async (original) => ({
  ...(await original<typeof import("next-auth")>()),
  getServerSession: async () => (signedIn.user ? { user: signedIn.user, expires: new Date(Date.now() + 3_600_000).toISOString() } : null),
}));

/** What the roster routes answer, field by field; each test reads the fields its route sends. */
interface Body {
  error: { code: string; message: string; fields?: Record<string, string[]> };
  key: string;
  dropped: boolean;
  robot: { id: string; name: string };
  robots: { id: string; retiredAt: number | null }[];
  missions: { id: number }[];
  frame: unknown;
  settings: RobotSettings;
  custom: string[];
}

type Handler = (req: NextRequest, segment?: { params?: Promise<Record<string, string>> }) => Promise<Response>;

let server: TestServer;
let routes: {
  list: { GET: Handler; POST: Handler };
  detail: { GET: Handler };
  key: { POST: Handler };
  retire: { POST: Handler };
  settings: { GET: Handler; PUT: Handler; DELETE: Handler };
  tune: { POST: Handler };
};
const accounts: Record<Role, { id: string; email: string; name: string; role: Role }> = {} as never;
const cleanup: (() => void)[] = [];

function as(role: Role | null): void {
  signedIn.user = role ? accounts[role] : null;
}

async function call(handler: Handler, opts: { id?: string; body?: unknown; query?: string } = {}) {
  const url = `http://tessera.test/api/robots${opts.id ? `/${opts.id}` : ""}${opts.query ?? ""}`;
  const init = opts.body === undefined ? {} : { method: "POST", body: typeof opts.body === "string" ? opts.body : JSON.stringify(opts.body), headers: { "content-type": "application/json" } };
  const params: Record<string, string> = opts.id ? { id: opts.id } : {};
  const res = await handler(new NextRequest(url, init), { params: Promise.resolve(params) });
  return { status: res.status, body: (await res.json()) as Body };
}

let counter = 0;
async function register(asRole: Role = "admin", extra: Record<string, unknown> = {}) {
  as(asRole);
  counter += 1;
  return call(routes.list.POST, { body: { name: `Roster probe ${process.pid}-${counter}`, drive: "differential", sensors: TEST_SENSORS, simulated: true, ...extra } });
}

async function auditRows(action: string, target: string) {
  return server.db.select().from(audit).where(and(eq(audit.action, action), eq(audit.target, target)));
}

/** Connects and says hello; collects what the server sends. */
async function online(id: string, key: string) {
  const socket = await connectRobot(server.url, { robot: id, key });
  cleanup.push(() => socket.close());
  const tunes: ServerMessage["tune"][] = [];
  socket.on("tune", (m: ServerMessage["tune"]) => tunes.push(m));
  const disconnected = new Promise<string>((resolve) => socket.once("disconnect", resolve));
  const ack = await socket.call("hello", helloPayload(1));
  expect(ack.ok).toBe(true);
  return { socket, tunes, disconnected };
}

const handshake = (id: string, key: string) => tryRobotHandshake(`${server.url}/robot`, { robot: id, key });

function tuned(): RobotSettings {
  return {
    motion: { forward: { ok: 0.6, stall: 0.3, over: 0.1 }, turn: { ok: 0.85, none: 0.1, reverse: 0.05 }, mix: 0.01, cost: { forward: 1, turn: 0.7, bump: 8 } },
    sensing: { range: { sigmaM: 0.09, lambdaShort: 1.1, weights: { hit: 0.6, short: 0.2, max: 0.05, rand: 0.15 } }, floor: { hit: 0.7 } },
    gains: { kp: 4.5, ki: 0.25, kd: 0.08 },
  };
}

beforeAll(async () => {
  const databaseUrl = inject("databaseUrl");
  process.env.DATABASE_URL = databaseUrl;
  process.env.NEXTAUTH_SECRET = "tessera-integration-secret";
  server = await startTestServer(databaseUrl);
  registry().fleet = server.fleet;
  for (const role of ["admin", "operator", "viewer"] as const) {
    const row = (await server.db.select().from(users).where(eq(users.email, `${role}@tessera.test`)).limit(1))[0];
    accounts[role] = { id: String(row.id), email: row.email, name: row.name, role };
  }
  routes = {
    list: await import("../../app/api/robots/route"),
    detail: await import("../../app/api/robots/[id]/route"),
    key: await import("../../app/api/robots/[id]/key/route"),
    retire: await import("../../app/api/robots/[id]/retire/route"),
    settings: await import("../../app/api/robots/[id]/settings/route"),
    tune: await import("../../app/api/robots/[id]/tune/route"),
  };
});

afterAll(async () => {
  for (const fn of cleanup) fn();
  registry().fleet = undefined;
  await server.stop();
});

describe("who may do what on the roster", () => {
  it("asks a signed-out visitor to sign in, on every roster route", async () => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    as(null);
    const answers = [
      await call(routes.list.GET),
      await call(routes.list.POST, { body: { name: "Nobody's", drive: "differential", sensors: [] } }),
      await call(routes.detail.GET, { id }),
      await call(routes.key.POST, { id, body: {} }),
      await call(routes.retire.POST, { id, body: {} }),
      await call(routes.settings.GET, { id }),
      await call(routes.settings.PUT, { id, body: tuned() }),
      await call(routes.settings.DELETE, { id }),
      await call(routes.tune.POST, { id, body: {} }),
    ];
    expect(answers.map((a) => a.status)).toEqual([401, 401, 401, 401, 401, 401, 401, 401, 401]);
    expect(answers[3].body).toEqual({ error: { code: "unauthorized:key", message: "Sign in first." } });
  });

  it.each(["viewer", "operator"] as const)("refuses the admin actions to a %s with 403 and changes nothing", async (role) => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    const before = (await server.db.select().from(robots).where(eq(robots.id, id)))[0];
    as(role);
    const refused = {
      register: await call(routes.list.POST, { body: { name: "Not mine", drive: "differential", sensors: [] } }),
      key: await call(routes.key.POST, { id, body: {} }),
      retire: await call(routes.retire.POST, { id, body: {} }),
      save: await call(routes.settings.PUT, { id, body: tuned() }),
      reset: await call(routes.settings.DELETE, { id }),
      tune: await call(routes.tune.POST, { id, body: {} }),
    };
    for (const [surface, answer] of Object.entries({ robots: refused.register, key: refused.key, retire: refused.retire, settings: refused.save, tune: refused.tune })) {
      expect(answer).toEqual({ status: 403, body: { error: { code: `forbidden:${surface}`, message: `This needs the admin role; you are ${role}.` } } });
    }
    expect(refused.reset.status).toBe(403);
    const after = (await server.db.select().from(robots).where(eq(robots.id, id)))[0];
    expect(after).toEqual(before);
    expect(await server.db.select().from(robots).where(eq(robots.name, "Not mine"))).toEqual([]);
  });

  it("lets a viewer read the roster, a robot and its settings", async () => {
    const { body: made } = await register();
    as("viewer");
    expect((await call(routes.list.GET)).status).toBe(200);
    expect((await call(routes.detail.GET, { id: made.robot.id })).status).toBe(200);
    expect((await call(routes.settings.GET, { id: made.robot.id })).status).toBe(200);
  });
});

describe("registering a robot", () => {
  it("shows the key once and never again, in no answer and not as its hash", async () => {
    const { status, body } = await register("admin", { drive: "bicycle" });
    expect(status).toBe(201);
    const key = body.key as string;
    expect(key).toMatch(/^tsk_[A-Za-z0-9_-]{43}$/);
    const id = body.robot.id as string;
    const row = (await server.db.select().from(robots).where(eq(robots.id, id)))[0];
    expect(row.keyHash).not.toContain(key);
    as("admin");
    const list = await call(routes.list.GET);
    const detail = await call(routes.detail.GET, { id });
    const settings = await call(routes.settings.GET, { id });
    expect(list.body.robots.find((r) => r.id === id)).toMatchObject({ name: body.robot.name, drive: "bicycle", simulated: true, online: false, state: "offline" });
    for (const answer of [list, detail, settings]) {
      const text = JSON.stringify(answer.body);
      expect(text).not.toContain(key);
      expect(text).not.toContain(row.keyHash);
      expect(text).not.toMatch(/keyHash|key_hash/);
    }
    expect(await handshake(id, key)).toEqual({ connected: true });
    const [entry] = await auditRows("register", id);
    expect(entry).toMatchObject({ userId: Number(accounts.admin.id), detail: { name: body.robot.name, drive: "bicycle", simulated: true } });
  });

  it("refuses a bad registration with the field at fault and stores nothing", async () => {
    const { status, body } = await register("admin", { name: "Bad sensors", sensors: [{ id: "us-front", kind: "range", bearingDeg: 270, maxRangeM: 2 }] });
    expect(status).toBe(400);
    expect(body.error.fields).toHaveProperty(["sensors.0.bearingDeg"]);
    expect(await server.db.select().from(robots).where(eq(robots.name, "Bad sensors"))).toEqual([]);
  });
});

describe("rotating a key", () => {
  it("drops the connected robot, refuses the old key at once and admits the new one", async () => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    const oldKey = made.key as string;
    const robot = await online(id, oldKey);
    as("admin");
    const rotated = await call(routes.key.POST, { id, body: {} });
    expect(rotated.status).toBe(200);
    expect(rotated.body.dropped).toBe(true);
    const newKey = rotated.body.key as string;
    expect(newKey).toMatch(/^tsk_/);
    expect(newKey).not.toBe(oldKey);
    expect(await robot.disconnected).toBe("io server disconnect");
    expect(await handshake(id, oldKey)).toEqual({ connected: false, data: { code: "bad_key" } });
    expect(await handshake(id, newKey)).toEqual({ connected: true });
    const again = await online(id, newKey);
    expect(again.socket.connected).toBe(true);
    const [entry] = await auditRows("rotate-key", id);
    expect(entry).toMatchObject({ userId: Number(accounts.admin.id), detail: { dropped: true } });
    expect(JSON.stringify(entry.detail)).not.toContain(newKey);
    const detail = await call(routes.detail.GET, { id });
    expect(JSON.stringify(detail.body)).not.toContain(newKey);
  });

  it("answers 404 for a robot that is not on the roster", async () => {
    as("admin");
    const answer = await call(routes.key.POST, { id: "rb-nobody", body: {} });
    expect(answer).toEqual({ status: 404, body: { error: { code: "not_found:robot", message: "There is no robot rb-nobody on the roster." } } });
  });
});

describe("retiring a robot", () => {
  it("aborts and keeps its mission, closes its link, refuses it at connect and takes it off the live floor", async () => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    const robot = await online(id, made.key);
    const actor = { userId: Number(accounts.admin.id), label: "admin@tessera.test" };
    await server.fleet.relocate(id, { row: 10, col: 16, heading: "W" }, actor);
    const mission = await server.fleet.dispatch(id, { row: 10, col: 4 }, actor);
    const removed = new Promise<string>((resolve) => server.fleet.on("removed", (r) => r.robotId === id && resolve(r.robotId)));
    as("admin");
    const answer = await call(routes.retire.POST, { id, body: {} });
    expect(answer.status).toBe(200);
    expect(answer.body.robot.id).toBe(id);
    expect(await robot.disconnected).toBe("io server disconnect");
    expect(await removed).toBe(id);
    expect(server.fleet.robots.has(id)).toBe(false);
    expect(server.fleet.frames().map((f) => f.robotId)).not.toContain(id);
    expect(await handshake(id, made.key)).toEqual({ connected: false, data: { code: "retired" } });
    const kept = (await server.db.select().from(missions).where(eq(missions.id, mission.id)))[0];
    expect(kept.state).toBe("aborted");
    const replayed = await replayMission(server.fleet, mission.id, 0);
    expect(replayed.mission.id).toBe(mission.id);
    expect(replayed.certainty.row).toBe(10);
    expect(replayed.certainty.col).toBe(16);

    const list = await call(routes.list.GET);
    expect(list.body.robots.map((r) => r.id)).not.toContain(id);
    const withRetired = await call(routes.list.GET, { query: "?retired=1" });
    expect(withRetired.body.robots.find((r) => r.id === id)!.retiredAt).toBeGreaterThan(0);
    const detail = await call(routes.detail.GET, { id });
    expect(detail.body.missions.map((m) => m.id)).toEqual([mission.id]);
    expect(detail.body.frame).toBeNull();

    expect((await call(routes.retire.POST, { id, body: {} })).body.error).toEqual({ code: "conflict:retire", message: `${made.robot.name} is retired.` });
    expect((await call(routes.key.POST, { id, body: {} })).status).toBe(409);
    expect(await auditRows("retire", id)).toHaveLength(1);
  });
});

describe("a robot's settings", () => {
  it("starts from the defaults of lib/ for its drive", async () => {
    const { body: made } = await register("admin", { drive: "bicycle" });
    as("viewer");
    const { body } = await call(routes.settings.GET, { id: made.robot.id });
    expect(body).toEqual({ robotId: made.robot.id, drive: "bicycle", settings: defaultRobotSettings("bicycle"), defaults: defaultRobotSettings("bicycle"), custom: [] });
  });

  it("refuses out-of-range values with 422 and their field paths, and keeps what was stored", async () => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    as("admin");
    expect((await call(routes.settings.PUT, { id, body: tuned() })).status).toBe(200);
    const bad = tuned();
    bad.motion.mix = 0.9;
    bad.sensing.range.weights.rand = 0.5;
    bad.gains.kp = -2;
    const answer = await call(routes.settings.PUT, { id, body: bad });
    expect(answer.status).toBe(422);
    expect(answer.body.error.code).toBe("unprocessable:settings");
    expect(answer.body.error.fields).toEqual({
      "motion.mix": ["must be under 0.5"],
      "sensing.range.weights": ["hit, short, max and rand must add up to 1"],
      "gains.kp": ["must be 0 or more"],
    });
    expect((await call(routes.settings.GET, { id })).body.settings).toEqual(tuned());
    expect(server.fleet.robots.get(id)!.motion).toEqual(motionModelOf("differential", tuned()));
    const notJson = await call(routes.settings.PUT, { id, body: "{ not json" });
    expect(notJson.status).toBe(400);
  });

  it("applies saved parameters to the live filter from its next update, and resets to the defaults", async () => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    // A fresh robot's belief is uniform, so the sensor model decides the posterior.
    const robot = await online(id, made.key);
    as("admin");
    const saved = await call(routes.settings.PUT, { id, body: tuned() });
    expect(saved.status).toBe(200);
    expect(saved.body.custom).toEqual(["motion", "sensing", "gains"]);

    const runtime = server.fleet.robots.get(id)!;
    expect(runtime.motion).toEqual({ drive: "differential", ...tuned().motion });
    expect(runtime.sensorModel).toEqual(tuned().sensing);
    // The same sense update computed apart with the new sensor model must give the same belief.
    const before = Float64Array.from(runtime.filter.belief);
    const readings = [
      { sensor: "us-front", rangeM: 1.2 },
      { sensor: "us-left", rangeM: 0.5 },
      { sensor: "us-right", rangeM: 0.2 },
      { sensor: "floor", mark: 0 },
    ];
    const expected = createFilter(runtime.plan, motionModelOf("differential", tuned()), TEST_SENSORS, tuned().sensing);
    expected.reset(before);
    expected.sense(readings);
    const withDefaults = createFilter(runtime.plan, motionModelOf("differential", defaultRobotSettings("differential")), TEST_SENSORS, defaultRobotSettings("differential").sensing);
    withDefaults.reset(before);
    withDefaults.sense(readings);
    expect((await robot.socket.call("sensed", { seq: 2, at: Date.now(), readings })).ok).toBe(true);
    const live = server.fleet.robots.get(id)!.filter.belief;
    let gapNew = 0;
    let gapDefault = 0;
    for (let s = 0; s < live.length; s++) {
      gapNew = Math.max(gapNew, Math.abs(live[s] - expected.belief[s]));
      gapDefault = Math.max(gapDefault, Math.abs(live[s] - withDefaults.belief[s]));
    }
    expect(gapNew).toBeLessThan(1e-12);
    expect(gapDefault).toBeGreaterThan(1e-4);

    const reset = await call(routes.settings.DELETE, { id });
    expect(reset.body).toMatchObject({ settings: defaultRobotSettings("differential"), custom: [] });
    expect(server.fleet.robots.get(id)!.motion).toEqual({ drive: "differential", ...defaultRobotSettings("differential").motion });
    expect((await server.db.select().from(robots).where(eq(robots.id, id)))[0].settings).toBeNull();
    const [changed] = await auditRows("settings-change", id);
    expect(changed.detail).toMatchObject({ changed: ["motion", "sensing", "gains"] });
    expect(await auditRows("settings-reset", id)).toHaveLength(1);
  });
});

describe("pushing gains with tune", () => {
  it("sends the saved gains to the connected robot as PROTOCOL.md's tune", async () => {
    const { body: made } = await register();
    const id = made.robot.id as string;
    as("admin");
    await call(routes.settings.PUT, { id, body: tuned() });
    const offline = await call(routes.tune.POST, { id, body: {} });
    expect(offline.status).toBe(422);
    expect(offline.body.error.message).toBe(`${made.robot.name} is not connected; the gains are saved and can be pushed when it is.`);

    const robot = await online(id, made.key);
    const pushed = await call(routes.tune.POST, { id, body: {} });
    expect(pushed).toEqual({ status: 200, body: { gains: { kp: 4.5, ki: 0.25, kd: 0.08 } } });
    await expect.poll(() => robot.tunes.length).toBe(1);
    expect(robot.tunes[0]).toEqual({ pid: { kp: 4.5, ki: 0.25, kd: 0.08 } });
    expect(TuneSchema.safeParse(robot.tunes[0]).success).toBe(true);
    const [entry] = await auditRows("tune", id);
    expect(entry.detail).toEqual({ gains: { kp: 4.5, ki: 0.25, kd: 0.08 } });

    // A robot that reconnects (a reboot forgets pushed gains) gets them again after its hello,
    // from this server and from one restarted on the same database.
    robot.socket.close();
    const back = await online(id, made.key);
    await expect.poll(() => back.tunes).toEqual([{ pid: { kp: 4.5, ki: 0.25, kd: 0.08 } }]);
    back.socket.close();
    await server.fleet.writer.flush();
    const rebuilt = await server.fleet.load((await server.db.select().from(robots).where(eq(robots.id, id)))[0]);
    expect(rebuilt.tuned).toEqual({ kp: 4.5, ki: 0.25, kd: 0.08 });
  });

  it("sends no tune after hello to a robot whose gains were never pushed", async () => {
    const { body: made } = await register();
    const robot = await online(made.robot.id as string, made.key);
    await robot.socket.call("beat", { seq: 2, at: Date.now(), battery: 0.9, status: "ok" });
    expect(robot.tunes).toEqual([]);
  });
});
