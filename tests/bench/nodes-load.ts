/**
 * `npm run bench:nodes`: the load script's run (scripts/load/run.ts) against one node,
 * one node through Redis, and two nodes sharing the fleet through Redis, on loopback with
 * a private MariaDB and Redis. Robots are spread over the nodes in turn; the dashboards
 * watch from the first node, so with two nodes half the frames they time crossed Redis.
 *
 * Settings: TESSERA_NODES_DB_PORT (3420), TESSERA_NODES_REDIS_PORT (6417),
 * TESSERA_NODES_PORT (3520 and the next), LOAD_ROBOTS (40), LOAD_SECONDS (30), LOAD_RATE (5).
 */
import path from "node:path";
import { openDb } from "../../db/client";
import { defaultFloorplanId } from "../../db/queries/floorplans";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";
import { robots } from "../../db/schema";
import { DEMO_SENSORS } from "../../db/seed";
import { DATA_DIR, prepareDatabase } from "../../scripts/local-env";
import { startLocalRedis } from "../../scripts/local-redis";
import { formatReport, runLoad, type LoadReport } from "../../scripts/load/run";
import { sessionCookie } from "../support/fleet-server";
import { NODE_SECRET, startNode, type NodeProcess } from "../support/node-process";

const DB_PORT = Number(process.env.TESSERA_NODES_DB_PORT ?? 3420);
const REDIS_PORT = Number(process.env.TESSERA_NODES_REDIS_PORT ?? 6417);
const NODE_PORT = Number(process.env.TESSERA_NODES_PORT ?? 3520);
const ROBOTS = Number(process.env.LOAD_ROBOTS ?? 40);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 30);
const RATE = Number(process.env.LOAD_RATE ?? 5);

const prepared = await prepareDatabase({ instance: "mariadb-nodes", port: DB_PORT, database: "tessera_nodes", fresh: true, seed: { demoPassword: "demo-tessera" } });
const db = openDb(prepared.url);
const floorplanId = (await defaultFloorplanId(db)) as number;
const redis = await startLocalRedis({ dir: path.join(DATA_DIR, "redis-nodes"), port: REDIS_PORT });
const cookies = [await sessionCookie(db, "operator", NODE_SECRET), await sessionCookie(db, "viewer", NODE_SECRET)];

/** Fresh robots for each configuration, so no run starts from another's seqs, beliefs or leases; on the roster before any node starts, as nodes load the roster at start-up. */
async function loadRobots(run: number): Promise<{ id: string; key: string }[]> {
  const fleet = Array.from({ length: ROBOTS }, (_, i) => ({ id: `load-${run}-${i + 1}`, key: generateRobotKey() }));
  await db.insert(robots).values(fleet.map((r) => ({ id: r.id, name: r.id, keyHash: hashRobotKey(r.key), drive: "differential" as const, sensors: DEMO_SENSORS, simulated: false, floorplanId })));
  return fleet;
}
const fleets = [await loadRobots(1), await loadRobots(2), await loadRobots(3)];

async function measure(label: string, nodes: NodeProcess[], fleet: { id: string; key: string }[]): Promise<LoadReport> {
  const report = await runLoad({
    url: nodes[0].url,
    robotUrls: nodes.map((n) => n.url),
    db,
    robots: fleet,
    sensors: DEMO_SENSORS,
    floorplanId,
    ratePerRobot: RATE,
    durationMs: SECONDS * 1000,
    dashboardCookies: cookies,
    origin: nodes[0].url,
    sample: Object.fromEntries(nodes.map((n, i) => [`node ${String.fromCharCode(65 + i)}`, n.child.pid as number])),
    log: (line) => console.log(`${label}: ${line}`),
  });
  console.log(`\n== ${label}\n${formatReport(report)}\n`);
  return report;
}

const env = (id: string) => ({ REDIS_URL: redis.url, TESSERA_NODE_ID: id });
const lost: string[] = [];
try {
  for (const [i, [label, start]] of ([
    ["one node", () => Promise.all([startNode({ port: NODE_PORT, databaseUrl: prepared.url })])],
    // What leases, fencing and the adapter cost without a second node.
    ["one node through Redis", () => Promise.all([startNode({ port: NODE_PORT, databaseUrl: prepared.url, env: env("load-alone") })])],
    [
      "two nodes",
      () =>
        Promise.all([
          startNode({ port: NODE_PORT, databaseUrl: prepared.url, env: env("load-a") }),
          startNode({ port: NODE_PORT + 1, databaseUrl: prepared.url, env: env("load-b") }),
        ]),
    ],
  ] as const).entries()) {
    const nodes = await start();
    try {
      if (!(await measure(label, nodes, fleets[i])).nothingLost) lost.push(label);
    } finally {
      await Promise.all(nodes.map((n) => n.kill("SIGTERM")));
    }
  }
} finally {
  await redis.stop();
  await prepared.local?.stop();
}
if (lost.length) {
  console.error(`something was lost in: ${lost.join(", ")}`);
  process.exit(1);
}
process.exit(0);
