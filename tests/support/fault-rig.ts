/**
 * The fault suite's rig: its own MariaDB (stopped and restarted by the scenarios), the
 * real server in its own process, simulated robots whose every acknowledgement is
 * recorded, and a signed-in /ops dashboard that keeps the frames it receives. Everything
 * is on loopback, on ports from TESSERA_FAULT_DB_PORT and TESSERA_FAULT_PORT.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, expect } from "vitest";
import { io, type Socket } from "socket.io-client";
import { closeDb, openDb, type Db } from "../../db/client";
import { startLocalMariadb, type LocalMariadb } from "../../db/local-mariadb";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";
import { DEMO_FLOORPLAN_FILE, DEMO_FLOORPLAN_NAME, DEMO_SENSORS, type DemoRobot } from "../../db/seed";
import { floorplanByName } from "../../db/queries/floorplans";
import { robots } from "../../db/schema";
import { parseFloorplan, type Floorplan } from "../../lib/floorplan";
import type { Ack, OpsAck, RobotFrame } from "../../lib/protocol";
import type { RobotEventName } from "../../lib/protocol";
import { startSimRobot, type SimEvent, type SimHandle } from "../../simulators/sim-robot";
import { DATA_DIR, keptSecret, prepareDatabase } from "../../scripts/local-env";
import { NODE_SECRET, startNode, type NodeProcess } from "./node-process";
import { sessionCookie } from "./fleet-server";
import { checkNothingLost, rebuiltFrame } from "./nothing-lost";

export const FAULT_DB_PORT = Number(process.env.TESSERA_FAULT_DB_PORT ?? 3419);
export const FAULT_PORT = Number(process.env.TESSERA_FAULT_PORT ?? 3519);
const INSTANCE = "mariadb-faults";
const DATABASE = "tessera_faults";

/** Fast fleet settings for the suite (FLEET_ENV in server/config.ts). */
export const FAST_FLEET_ENV: Record<string, string> = {
  HEARTBEAT_TIMEOUT_MS: "3000",
  FLEET_WRITE_TICK_MS: "5",
  FLEET_BELIEF_FRAME_HZ: "10",
  FLEET_TRAFFIC_REPLAN_MS: "2000",
};

export const demoPlan: Floorplan = parseFloorplan(readFileSync(DEMO_FLOORPLAN_FILE, "utf8"));

export const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export interface FaultDb {
  url: string;
  db: Db;
  robots: (DemoRobot & { key: string })[];
  floorplanId: number;
  /** Clean shutdown of the instance (its data stays). */
  stop(): Promise<void>;
  /** Starts the instance again on the same data directory. */
  start(): Promise<void>;
}

/** A fresh, migrated and seeded database on the suite's own MariaDB instance. */
export async function startFaultDb(): Promise<FaultDb> {
  const prepared = await prepareDatabase({ instance: INSTANCE, port: FAULT_DB_PORT, database: DATABASE, fresh: true, seed: { demoPassword: "demo-tessera" }, log: () => {} });
  let local: LocalMariadb | undefined = prepared.local;
  const db = openDb(prepared.url);
  const floorplan = await floorplanByName(db, DEMO_FLOORPLAN_NAME);
  if (!floorplan || !prepared.fleet) throw new Error("the fault database was not seeded with the demo floor and fleet");
  return {
    url: prepared.url,
    db,
    robots: prepared.fleet.robots,
    floorplanId: floorplan.id,
    async stop() {
      await local?.stop();
      local = undefined;
    },
    async start() {
      local = await startLocalMariadb({
        dir: path.join(DATA_DIR, INSTANCE),
        port: FAULT_DB_PORT,
        databases: [DATABASE],
        user: "tessera",
        password: keptSecret(`${INSTANCE}-password`, 18),
      });
    },
  };
}

/** Ends the test process's pool and the instance; for afterAll, so it never throws. */
export async function stopFaultDb(faultDb: FaultDb | undefined): Promise<void> {
  await closeDb().catch(() => {});
  await faultDb?.stop().catch(() => {});
}

export function startFaultNode(databaseUrl: string, env: Record<string, string> = {}, healthTimeoutMs?: number): Promise<NodeProcess> {
  return startNode({ port: FAULT_PORT, databaseUrl, env: { ...FAST_FLEET_ENV, ...env }, healthTimeoutMs });
}

/** Registers one more robot straight in the database (before the server starts, which loads it). */
export async function insertRobot(db: Db, id: string, floorplanId: number): Promise<{ id: string; key: string }> {
  const key = generateRobotKey();
  await db.insert(robots).values({ id, name: `Probe ${id}`, keyHash: hashRobotKey(key), drive: "differential", sensors: DEMO_SENSORS, simulated: true, floorplanId });
  return { id, key };
}

/** The server's resident set size in bytes, from /proc. */
export function rssOf(pid: number): number {
  const status = readFileSync(`/proc/${pid}/status`, "utf8");
  const kb = Number(/VmRSS:\s+(\d+)\s+kB/.exec(status)?.[1]);
  if (!Number.isFinite(kb)) throw new Error(`no VmRSS in /proc/${pid}/status`);
  return kb * 1024;
}

export interface AckRecord {
  at: number;
  event: RobotEventName;
  seq: number;
  ack: Ack;
}

/** A simulated robot whose every acknowledgement (retried refusals included) is kept. */
export interface TrackedRobot {
  id: string;
  sim: SimHandle;
  acks: AckRecord[];
  events: SimEvent[];
  /** Seqs acknowledged ok (dup included). */
  okSeqs(): number[];
  /** Seqs refused `internal` at least once. */
  internalSeqs(): number[];
}

export function startTrackedRobot(url: string, spec: DemoRobot & { key: string }, seed: number, timeScale = 8): TrackedRobot {
  const acks: AckRecord[] = [];
  const events: SimEvent[] = [];
  const sim = startSimRobot({
    url,
    spec,
    plan: demoPlan,
    seed,
    timeScale,
    idleSenseMs: 1000,
    link: {
      ackTimeoutMs: 2000,
      reconnectDelayMs: 200,
      reconnectDelayMaxMs: 1000,
      onAck: (event, seq, ack) => acks.push({ at: Date.now(), event, seq, ack }),
    },
    onEvent: (e) => events.push(e),
  });
  return {
    id: spec.id,
    sim,
    acks,
    events,
    okSeqs: () => acks.filter((a) => a.ack.ok).map((a) => a.seq),
    internalSeqs: () => [...new Set(acks.filter((a) => !a.ack.ok && a.ack.code === "internal").map((a) => a.seq))],
  };
}

/** Per robot, the seqs it saw acknowledged ok: the input of checkNothingLost. */
export function ackedSeqs(robots: TrackedRobot[]): Map<string, number[]> {
  return new Map(robots.map((r) => [r.id, r.okSeqs()]));
}

/** Internal refusals that were never followed by an ok ack of the same seq: messages that would be lost. */
export function refusedThenLost(robots: TrackedRobot[]): Record<string, number[]> {
  const lost: Record<string, number[]> = {};
  for (const r of robots) {
    const ok = new Set(r.okSeqs());
    const missing = r.internalSeqs().filter((seq) => !ok.has(seq));
    if (missing.length) lost[r.id] = missing;
  }
  return lost;
}

/** Waits until every robot's outbox is empty (everything sent was acknowledged). */
export async function drained(robots: TrackedRobot[], timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (robots.some((r) => r.sim.client.pending > 0)) {
    if (Date.now() > deadline) throw new Error(`outboxes not drained: ${robots.map((r) => `${r.id} ${r.sim.client.pending}`).join(", ")}`);
    await sleep(50);
  }
}

export interface Dashboard {
  socket: Socket;
  /** Every robot frame received, with its arrival time. */
  frames: { at: number; frame: RobotFrame }[];
  /** The last belief frame per robot. */
  beliefs: Map<string, { at: number; scale: number; data: number[] }>;
  latest(robotId: string): RobotFrame | undefined;
  command(name: string, payload: unknown): Promise<OpsAck>;
  close(): void;
}

/** A signed-in operator dashboard on the /ops feed, watching one floorplan (again after every reconnect). */
export async function openDashboard(url: string, db: Db, floorplanId: number): Promise<Dashboard> {
  const cookie = await sessionCookie(db, "operator", NODE_SECRET);
  const socket = io(`${url}/ops`, {
    transports: ["websocket"],
    extraHeaders: { cookie },
    reconnectionDelay: 200,
    reconnectionDelayMax: 1000,
  });
  const frames: Dashboard["frames"] = [];
  const beliefs: Dashboard["beliefs"] = new Map();
  socket.on("robot", (frame: RobotFrame) => frames.push({ at: Date.now(), frame }));
  socket.on("belief", (b: { robotId: string; scale: number; data: Uint8Array }) => beliefs.set(b.robotId, { at: Date.now(), scale: b.scale, data: [...new Uint8Array(b.data)] }));
  socket.on("connect", () => socket.emit("watch", { floorplanId }, () => {}));
  await new Promise<void>((resolve, reject) => {
    socket.once("connect", () => resolve());
    socket.once("connect_error", reject);
  });
  return {
    socket,
    frames,
    beliefs,
    latest: (robotId) => frames.findLast((f) => f.frame.robotId === robotId)?.frame,
    command: (name, payload) => socket.timeout(30_000).emitWithAck(name, payload) as Promise<OpsAck>,
    close: () => void socket.close(),
  };
}

/** Relocates each robot onto its true start and sends it to its goal; throws with the server's message when one is refused. */
export async function sendOnMissions(dashboard: Dashboard, missions: { robot: DemoRobot; goal: { row: number; col: number } }[]): Promise<void> {
  for (const { robot, goal } of missions) {
    const relocated = await dashboard.command("relocate", { robotId: robot.id, ...robot.start });
    if (!relocated.ok) throw new Error(`relocate ${robot.id}: ${relocated.error.message}`);
    const dispatched = await dashboard.command("dispatch", { robotId: robot.id, goal });
    if (!dispatched.ok) throw new Error(`dispatch ${robot.id}: ${dispatched.error.message}`);
  }
}

/** The step of each robot's mission as the dashboard saw it last (null: no mission). */
export function missionSteps(dashboard: Dashboard, ids: string[]): Record<string, number | null> {
  return Object.fromEntries(ids.map((id) => [id, dashboard.latest(id)?.mission?.step ?? null]));
}

/** Mission outcomes a robot was told (done events), per robot. */
export function outcomes(robot: TrackedRobot): string[] {
  return robot.events.filter((e) => e.kind === "done").map((e) => String(e.detail.outcome));
}

/**
 * The nothing-lost check at the end of a scenario: the robots finish what they sent and
 * go quiet; every seq acknowledged to them is stored exactly once, every `internal`
 * refusal was followed by an ok for the same seq, and the belief a rebuild from the
 * database gives equals the last belief frame the dashboard received from the live server.
 */
export async function expectNothingLost(db: Db, dashboard: Dashboard, robots: TrackedRobot[]): Promise<void> {
  // Missions still under way are cancelled, so the robots idle and their outboxes can empty.
  for (const r of robots) if (dashboard.latest(r.id)?.mission) await dashboard.command("cancel", { robotId: r.id });
  await drained(robots);
  for (const r of robots) r.sim.stop();
  // Quiet: the last messages are committed and the throttled belief frames have gone out.
  await sleep(1500);
  const report = await checkNothingLost(db, ackedSeqs(robots));
  expect(report.missing).toEqual({});
  expect(report.duplicated).toEqual({});
  expect(report.checked).toBeGreaterThan(robots.length * 10);
  expect(refusedThenLost(robots)).toEqual({});
  for (const r of robots) {
    const live = dashboard.beliefs.get(r.id);
    expect(live, `no belief frame for ${r.id}`).toBeDefined();
    expect(await rebuiltFrame(db, r.id), `rebuilt belief of ${r.id}`).toEqual({ scale: live?.scale, data: live?.data });
  }
}

/** Seqs up to `upTo` that never got a final answer (an ok, or a refusal other than `internal`). */
export function unanswered(robot: TrackedRobot, upTo: number): number[] {
  const answered = new Set(robot.acks.filter((a) => a.ack.ok || a.ack.code !== "internal").map((a) => a.seq));
  const out: number[] = [];
  for (let seq = 1; seq <= upTo; seq++) if (!answered.has(seq)) out.push(seq);
  return out;
}

/** The demo robots' long errands across the floor, so missions are under way when a fault hits. */
export const ERRANDS: Record<string, { row: number; col: number }> = {
  "nx-kestrel": { row: 14, col: 27 },
  "nx-otter": { row: 2, col: 27 },
  "nx-magpie": { row: 17, col: 2 },
  "nx-badger": { row: 3, col: 2 },
};

/** One scenario's stage: its own MariaDB, a server, a signed-in dashboard and the simulated robots, all online. */
export interface FaultScene {
  db: FaultDb;
  /** Replaced by a scenario that restarts the server. */
  node: NodeProcess;
  dashboard: Dashboard;
  robots: TrackedRobot[];
}

/**
 * Sets the stage before the file's tests and always tears it down after, even when a
 * test failed half-way. `beforeNode` adds rows the server must load at start-up.
 */
export function useFaultScene(seedBase: number, opts: { beforeNode?: (db: FaultDb) => Promise<void> } = {}): FaultScene {
  const scene: Partial<FaultScene> = {};
  beforeAll(async () => {
    const db = (scene.db = await startFaultDb());
    await opts.beforeNode?.(db);
    const node = (scene.node = await startFaultNode(db.url));
    scene.dashboard = await openDashboard(node.url, db.db, db.floorplanId);
    scene.robots = db.robots.map((spec, i) => startTrackedRobot(node.url, spec, seedBase + i));
    await Promise.all(scene.robots.map((r) => r.sim.ready()));
  }, 60_000);
  afterAll(async () => {
    for (const r of scene.robots ?? []) r.sim.stop();
    scene.dashboard?.close();
    await scene.node?.kill("SIGKILL");
    await stopFaultDb(scene.db);
  }, 30_000);
  return scene as FaultScene;
}
