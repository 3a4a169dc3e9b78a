/**
 * The two halves of robot ownership when several nodes share the fleet: leases in a real
 * Redis (one holder at a time, a larger fence for every new holder, expiry) and the fence
 * check in the writer's transaction against the real MariaDB (a node whose fence is older
 * than the stored one writes nothing at all).
 */
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { Redis } from "ioredis";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";
import { events, robots } from "../../db/schema";
import { DATA_DIR } from "../../scripts/local-env";
import { startLocalRedis, type LocalRedis } from "../../scripts/local-redis";
import { checkFences, FencedError } from "../../server/cluster/fence";
import { LeaseStore } from "../../server/cluster/lease";
import { FleetWriter } from "../../server/fleet/writer";
import { TEST_SENSORS } from "../support/fleet-server";

const REDIS_PORT = Number(process.env.TESSERA_NODES_REDIS_PORT ?? 6417);

let redisServer: LocalRedis | undefined;
let redis: Redis | undefined;
let db: Db;
let counter = 0;

beforeAll(async () => {
  db = openDb(inject("databaseUrl"));
  redisServer = await startLocalRedis({ dir: path.join(DATA_DIR, "redis-nodes"), port: REDIS_PORT });
  redis = new Redis(redisServer.url);
  await redis.flushall();
}, 60_000);

afterAll(async () => {
  redis?.disconnect();
  await redisServer?.stop();
  await closeDb();
});

async function newRobot(): Promise<string> {
  counter += 1;
  const id = `fence-${process.pid}-${counter}`;
  await db.insert(robots).values({ id, name: `Fence probe ${counter}`, keyHash: hashRobotKey(generateRobotKey()), drive: "differential", sensors: TEST_SENSORS, simulated: true });
  return id;
}

function writerUnder(fences: Map<string, number>): FleetWriter {
  const writer = new FleetWriter(db, 5);
  writer.guard = (tx, ids) => checkFences(tx, ids, (id) => fences.get(id));
  return writer;
}

function logEvent(writer: FleetWriter, robotId: string, seq: number) {
  writer.event({ robotId, seq, missionId: null, source: "robot", kind: "beat", payload: { battery: 1, status: "ok" }, robotAt: Date.now(), receivedAt: new Date() });
  return writer.commit();
}

const stored = async (robotId: string, seq: number) => (await db.select({ id: events.id }).from(events).where(and(eq(events.robotId, robotId), eq(events.seq, seq)))).length;

describe("robot leases", () => {
  it("has one holder at a time, a larger fence for each new holder, and expires", async () => {
    const a = new LeaseStore(redis as Redis, "node-a", 600);
    const b = new LeaseStore(redis as Redis, "node-b", 600);
    const id = `lease-${process.pid}`;
    const first = await a.acquire(id);
    expect(first).toBe(1);
    expect(await b.acquire(id)).toBeNull();
    expect(await a.holder(id)).toEqual({ nodeId: "node-a", fence: 1 });
    expect(await b.renew(id, 1)).toBe(false);
    expect(await a.renew(id, 1)).toBe(true);
    await b.release(id, 1);
    expect(await a.holder(id)).toEqual({ nodeId: "node-a", fence: 1 });
    await a.release(id, 1);
    expect(await b.acquire(id)).toBe(2);
    // The old holder's renewal with its old fence does not revive its lease.
    expect(await a.renew(id, 1)).toBe(false);
    await new Promise((resolve) => setTimeout(resolve, 800));
    expect(await b.holder(id)).toBeNull();
    expect(await b.renew(id, 2)).toBe(false);
    expect(await a.acquire(id)).toBe(3);
  });

  it("takes a fence above the one stored in the database, which outlives a Redis restart", async () => {
    const a = new LeaseStore(redis as Redis, "node-a", 600);
    const id = `lease-restart-${process.pid}`;
    expect(await a.acquire(id, 0)).toBe(1);
    await a.release(id, 1);
    await (redis as Redis).flushall();
    expect(await a.acquire(id, 7)).toBe(8);
    await a.release(id, 8);
    expect(await a.acquire(id, 7)).toBe(9);
  });
});

describe("fenced writes", () => {
  it("refuses every write of a node whose fence is older than the stored one, and keeps the newer owner's", async () => {
    const id = await newRobot();
    const oldOwner = writerUnder(new Map([[id, 1]]));
    await logEvent(oldOwner, id, 1);
    expect((await db.select({ fence: robots.fence }).from(robots).where(eq(robots.id, id)))[0].fence).toBe(1);

    // Another node takes the robot over: its fence goes into the robot's row before it loads the robot.
    await checkFences(db, [id], () => 2);
    await expect(logEvent(oldOwner, id, 2)).rejects.toThrow(FencedError);
    expect(await stored(id, 2)).toBe(0);

    const newOwner = writerUnder(new Map([[id, 2]]));
    await logEvent(newOwner, id, 2);
    await logEvent(newOwner, id, 3);
    expect(await stored(id, 2)).toBe(1);
    expect((await db.select({ fence: robots.fence }).from(robots).where(eq(robots.id, id)))[0].fence).toBe(2);
  });

  it("fails a whole batch when one of its robots is fenced out, and refuses robots the node holds no lease for", async () => {
    const mine = await newRobot();
    const lost = await newRobot();
    await checkFences(db, [lost], () => 5);
    const writer = writerUnder(new Map([
      [mine, 1],
      [lost, 4],
    ]));
    writer.event({ robotId: mine, seq: 1, missionId: null, source: "robot", kind: "beat", payload: {}, robotAt: null, receivedAt: new Date() });
    await expect(logEvent(writer, lost, 1)).rejects.toThrow(`this node no longer owns robot ${lost}`);
    expect(await stored(mine, 1)).toBe(0);
    expect(await stored(lost, 1)).toBe(0);

    const stranger = writerUnder(new Map());
    await expect(logEvent(stranger, mine, 2)).rejects.toThrow(FencedError);
    expect(await stored(mine, 2)).toBe(0);
  });
});
