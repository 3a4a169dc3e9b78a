/**
 * Two Tessera nodes and one Redis on loopback, sharing one MariaDB: robots spread over both
 * nodes (each behind a balancer stand-in that prefers one node), a dashboard on node A that
 * sees node B's robots and drives them, then node B killed with SIGKILL mid-mission: node A
 * takes its robots over within the lease time, the missions go on, and the nothing-lost
 * check passes.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { inArray } from "drizzle-orm";
import { Redis } from "ioredis";
import { io as connect, type Socket } from "socket.io-client";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { defaultFloorplanId } from "../../db/queries/floorplans";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";
import { missions, robots } from "../../db/schema";
import { DEMO_FLOORPLAN_FILE } from "../../db/seed";
import { isFreeTile, parseFloorplan } from "../../lib/floorplan";
import type { BeliefFrame, OpsAck, RobotFrame } from "../../lib/protocol";
import { DATA_DIR } from "../../scripts/local-env";
import { startLocalRedis, type LocalRedis } from "../../scripts/local-redis";
import { startFleet, type Fleet as SimFleet, type SimRobotSpec } from "../../simulators/fleet-runner";
import { startBalancer, type Balancer } from "../support/balancer";
import { connectRobot, helloPayload, sessionCookie, TEST_SENSORS } from "../support/fleet-server";
import { NODE_SECRET, startNode, type NodeProcess } from "../support/node-process";
import { checkNothingLost, rebuiltFrame } from "../support/nothing-lost";

const REDIS_PORT = Number(process.env.TESSERA_NODES_REDIS_PORT ?? 6417);
const NODE_PORT = Number(process.env.TESSERA_NODES_PORT ?? 3520);
const LEASE_TTL_MS = 3000;
const plan = parseFloorplan(readFileSync(DEMO_FLOORPLAN_FILE, "utf8"));

let redisServer: LocalRedis | undefined;
let redis: Redis | undefined;
let db: Db;
const nodes: NodeProcess[] = [];
const balancers: Balancer[] = [];
const sims: SimFleet[] = [];
let dashboard: Socket | undefined;

const acked = new Map<string, number[]>();
const frames = new Map<string, RobotFrame>();
const beliefs = new Map<string, BeliefFrame>();

const holder = async (robotId: string) => (await (redis as Redis).get(`tessera:robot-lease:${robotId}`))?.split(":")[0] ?? null;

function nodeEnv(id: string, databaseUrl: string, redisUrl: string): Record<string, string> {
  return {
    REDIS_URL: redisUrl,
    TESSERA_NODE_ID: id,
    TESSERA_LEASE_TTL_MS: String(LEASE_TTL_MS),
    TESSERA_LEASE_RENEW_MS: "1000",
    TESSERA_NODE_TIMEOUT_MS: "1000",
    HEARTBEAT_TIMEOUT_MS: "5000",
    DATABASE_URL: databaseUrl,
  };
}

async function addRobot(floorplanId: number, n: number, start: SimRobotSpec["start"]): Promise<SimRobotSpec> {
  const id = `nodes-${process.pid}-${n}`;
  const key = generateRobotKey();
  await db.insert(robots).values({ id, name: `Node probe ${n}`, keyHash: hashRobotKey(key), drive: "differential", sensors: TEST_SENSORS, simulated: true, floorplanId });
  return { id, key, name: id, drive: "differential", sensors: TEST_SENSORS, start };
}

async function command<T = unknown>(name: string, payload: unknown): Promise<OpsAck<T>> {
  return (await (dashboard as Socket).timeout(10_000).emitWithAck(name, payload)) as OpsAck<T>;
}

beforeAll(async () => {
  const databaseUrl = inject("databaseUrl");
  db = openDb(databaseUrl);
  redisServer = await startLocalRedis({ dir: path.join(DATA_DIR, "redis-nodes"), port: REDIS_PORT });
  redis = new Redis(redisServer.url);
  await redis.flushall();
  const env = (id: string) => nodeEnv(id, databaseUrl, (redisServer as LocalRedis).url);
  const [a, b] = await Promise.all([startNode({ port: NODE_PORT, databaseUrl, env: env("node-a") }), startNode({ port: NODE_PORT + 1, databaseUrl, env: env("node-b") })]);
  nodes.push(a, b);
  balancers.push(await startBalancer([a.port, b.port]), await startBalancer([b.port, a.port]));
}, 90_000);

afterAll(async () => {
  dashboard?.close();
  await Promise.allSettled(sims.map((s) => s.stop()));
  await Promise.allSettled(balancers.map((b) => b.stop()));
  await Promise.allSettled(nodes.map((n) => n.kill("SIGKILL")));
  redis?.disconnect();
  await redisServer?.stop();
  await closeDb();
}, 60_000);

describe("two nodes sharing the fleet through Redis", { timeout: 180_000 }, () => {
  it("fans frames out, routes commands to the owner and takes a killed node's robots over", async () => {
    const [nodeA, nodeB] = nodes;
    const floorplanId = (await defaultFloorplanId(db)) as number;
    // Corridor starts (rows 10, 11 and 13 are free end to end), one robot under way per row, goals far enough to be mid-way at the kill.
    const specs = [
      await addRobot(floorplanId, 1, { row: 13, col: 3, heading: "E" }),
      await addRobot(floorplanId, 2, { row: 11, col: 27, heading: "W" }),
      await addRobot(floorplanId, 3, { row: 10, col: 27, heading: "W" }),
      await addRobot(floorplanId, 4, { row: 11, col: 2, heading: "E" }),
    ];
    const [r1, r2, r3, r4] = specs;
    const link = { reconnectDelayMs: 200, reconnectDelayMaxMs: 1000, ackTimeoutMs: 3000 };
    // One fleet runner per robot, so each robot's acknowledgements are recorded apart.
    for (const [spec, balancer] of [
      [r1, balancers[0]],
      [r2, balancers[0]],
      [r3, balancers[1]],
      [r4, balancers[1]],
    ] as const) {
      acked.set(spec.id, []);
      sims.push(
        await startFleet({
          url: balancer.url,
          plan,
          seed: 11,
          timeScale: 8,
          robots: [spec],
          link: { ...link, onAck: (_e, seq, ack) => ack.ok && acked.get(spec.id)?.push(seq) },
        }),
      );
    }

    await expect.poll(async () => Promise.all(specs.map((s) => holder(s.id))), { timeout: 10_000 }).toEqual(["node-a", "node-a", "node-b", "node-b"]);

    // A dashboard on node A.
    dashboard = connect(`${nodeA.url}/ops`, { transports: ["websocket"], extraHeaders: { cookie: await sessionCookie(db, "admin", NODE_SECRET), origin: nodeA.url }, reconnection: false });
    dashboard.on("robot", (f: RobotFrame) => frames.set(f.robotId, f));
    dashboard.on("belief", (b: BeliefFrame) => beliefs.set(b.robotId, b));
    await new Promise<void>((resolve, reject) => {
      (dashboard as Socket).once("welcome", () => resolve());
      (dashboard as Socket).once("connect_error", reject);
    });
    const watched = await command<{ robots: RobotFrame[] }>("watch", { floorplanId });
    expect(watched.ok).toBe(true);
    const listed = new Map((watched.ok ? watched.data.robots : []).map((f) => [f.robotId, f]));
    for (const spec of specs) expect(listed.get(spec.id), `watch lists ${spec.id}`).toMatchObject({ online: true });
    // Live frames of node B's robots reach node A's dashboard through the adapter.
    await expect.poll(() => frames.get(r3.id)?.online, { timeout: 5000 }).toBe(true);
    await expect.poll(() => beliefs.has(r4.id), { timeout: 8000 }).toBe(true);

    // A robot that reconnects to the other node is handed over: the old owner commits and lets go, the new one rebuilds it.
    const r5 = await addRobot(floorplanId, 5, { row: 16, col: 5, heading: "E" });
    const onA = await connectRobot(nodeA.url, { robot: r5.id, key: r5.key });
    expect(await onA.call("hello", helloPayload(1))).toMatchObject({ ok: true });
    expect(await onA.call("beat", { seq: 2, at: Date.now(), battery: 0.9, status: "ok" })).toMatchObject({ ok: true });
    expect(await holder(r5.id)).toBe("node-a");
    onA.close();
    const onB = await connectRobot(nodeB.url, { robot: r5.id, key: r5.key });
    expect(await holder(r5.id)).toBe("node-b");
    expect(await onB.call("hello", helloPayload(3))).toMatchObject({ ok: true, lastSeq: 3 });
    expect(await onB.call("beat", { seq: 2, at: Date.now(), battery: 0.9, status: "ok" })).toMatchObject({ ok: true, dup: true });
    onB.close();
    acked.set(r5.id, [1, 2, 3]);

    // The traffic rule spans nodes: a robot on node A is not sent onto a tile where a robot
    // served by node B stands (a free straight run away from the mission rows 10, 11 and 13).
    const row = Array.from({ length: plan.rows - 14 }, (_, i) => 14 + i).find((r) => Array.from({ length: 6 }, (_, k) => isFreeTile(plan, r, 2 + k)).every(Boolean)) as number;
    const [stander, mover] = [await addRobot(floorplanId, 6, { row, col: 3, heading: "E" }), await addRobot(floorplanId, 7, { row, col: 2, heading: "E" })];
    const standerLink = await connectRobot(nodeB.url, { robot: stander.id, key: stander.key });
    const moverLink = await connectRobot(nodeA.url, { robot: mover.id, key: mover.key });
    expect(await standerLink.call("hello", helloPayload(1))).toMatchObject({ ok: true });
    expect(await moverLink.call("hello", helloPayload(1))).toMatchObject({ ok: true });
    expect([await holder(stander.id), await holder(mover.id)]).toEqual(["node-b", "node-a"]);
    expect(await command("relocate", { robotId: stander.id, row, col: 3, heading: "E" })).toMatchObject({ ok: true });
    expect(await command("relocate", { robotId: mover.id, row, col: 2, heading: "E" })).toMatchObject({ ok: true });
    await expect.poll(() => frames.get(stander.id)?.estimate, { timeout: 5000 }).toMatchObject({ row, col: 3 });
    expect(await command("dispatch", { robotId: mover.id, goal: { row, col: 6 } })).toMatchObject({ ok: true });
    await expect.poll(() => frames.get(mover.id)?.holdReason, { timeout: 5000 }).toBe("traffic");
    expect(frames.get(mover.id)?.mission?.step).toBe(0);
    expect(await command("cancel", { robotId: mover.id })).toMatchObject({ ok: true });
    standerLink.close();
    moverLink.close();

    // Commands sent to node A run on node B, the owner.
    for (const spec of [r1, r3, r4]) {
      expect(await command("relocate", { robotId: spec.id, row: spec.start.row, col: spec.start.col, heading: spec.start.heading })).toMatchObject({ ok: true });
    }
    const goals = new Map([
      [r1.id, { row: 13, col: 24 }],
      [r3.id, { row: 10, col: 4 }],
      [r4.id, { row: 11, col: 25 }],
    ]);
    const missionIds = new Map<string, number>();
    for (const [robotId, goal] of goals) {
      const reply = await command<{ mission: { id: number } }>("dispatch", { robotId, goal });
      expect(reply, `dispatch ${robotId}`).toMatchObject({ ok: true });
      if (reply.ok) missionIds.set(robotId, reply.data.mission.id);
    }
    expect(await command("hold", { robotId: r4.id })).toMatchObject({ ok: true });
    await expect.poll(() => frames.get(r4.id)?.holdReason, { timeout: 5000 }).toBe("operator");
    expect(await command("release", { robotId: r4.id })).toMatchObject({ ok: true });
    expect(await command("release", { robotId: r4.id })).toMatchObject({ ok: false, error: { code: "unprocessable:release" } });
    await expect.poll(() => frames.get(r3.id)?.mission?.step ?? 0, { timeout: 20_000 }).toBeGreaterThanOrEqual(4);
    await expect.poll(() => frames.get(r4.id)?.mission?.step ?? 0, { timeout: 20_000 }).toBeGreaterThanOrEqual(2);
    expect(frames.get(r3.id)?.state).toBe("under_way");

    // Node B dies mid-mission.
    const stepsAtKill = frames.get(r3.id)?.mission?.step ?? 0;
    const killedAt = Date.now();
    await nodeB.kill("SIGKILL");
    await expect.poll(async () => [await holder(r3.id), await holder(r4.id)], { timeout: LEASE_TTL_MS + 8000, interval: 100 }).toEqual(["node-a", "node-a"]);
    const takeoverMs = Date.now() - killedAt;
    console.log(`node B killed at mission step ${stepsAtKill}; node A took its robots over after ${takeoverMs} ms (lease TTL ${LEASE_TTL_MS} ms)`);
    expect(takeoverMs).toBeLessThan(LEASE_TTL_MS + 3000);

    // The missions go on, now driven by node A, to their goals.
    await expect
      .poll(async () => (await db.select({ state: missions.state }).from(missions).where(inArray(missions.id, [...missionIds.values()]))).map((m) => m.state), { timeout: 120_000, interval: 500 })
      .toEqual(["reached", "reached", "reached"]);
    expect(frames.get(r3.id)?.mission ?? null).toBeNull();

    // Nothing acknowledged was lost or stored twice, and the belief rebuilt from the database is the one node A shows.
    await Promise.all(sims.map((s) => s.stop()));
    sims.length = 0;
    await new Promise((resolve) => setTimeout(resolve, 1500));
    const report = await checkNothingLost(db, acked);
    console.log(`nothing-lost check over ${report.checked} acknowledged messages`);
    expect(report.checked).toBeGreaterThan(100);
    expect(report.missing).toEqual({});
    expect(report.duplicated).toEqual({});
    for (const spec of [r3, r4]) {
      const live = beliefs.get(spec.id) as BeliefFrame;
      const rebuilt = await rebuiltFrame(db, spec.id);
      expect(live.scale).toBeCloseTo(rebuilt.scale, 6);
      expect([...live.data]).toEqual(rebuilt.data);
    }
  });
});
