/**
 * An in-process Tessera link for integration tests: the real fleet service, robot link
 * and MariaDB, without Next (pages are covered by the e2e suite).
 */
import { createServer, type Server as HttpServer } from "node:http";
import type { AddressInfo } from "node:net";
import { eq } from "drizzle-orm";
import { Server } from "socket.io";
import { io as connect, type Socket as ClientSocket } from "socket.io-client";
import { closeDb, openDb, type Db } from "../../db/client";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";
import { robots } from "../../db/schema";
import type { Ack } from "../../lib/protocol";
import type { SensorSpec } from "../../lib/sensing";
import { fleetConfig, type FleetConfig } from "../../server/config";
import { Fleet } from "../../server/fleet/fleet";
import { attachRobotLink } from "../../server/robot-link";

export const TEST_SENSORS: SensorSpec[] = [
  { id: "us-front", kind: "range", bearingDeg: 0, maxRangeM: 3 },
  { id: "us-left", kind: "range", bearingDeg: 90, maxRangeM: 3 },
  { id: "us-right", kind: "range", bearingDeg: -90, maxRangeM: 3 },
  { id: "floor", kind: "floor" },
];

export interface TestServer {
  url: string;
  db: Db;
  fleet: Fleet;
  addRobot(opts?: { simulated?: boolean; name?: string }): Promise<{ id: string; key: string }>;
  stop(): Promise<void>;
}

let counter = 0;

export async function startTestServer(databaseUrl: string, overrides: Partial<FleetConfig> = {}): Promise<TestServer> {
  const db = openDb(databaseUrl);
  const fleet = new Fleet(db, fleetConfig(overrides));
  await fleet.start();
  const http: HttpServer = createServer();
  const io = new Server(http, { maxHttpBufferSize: 64 * 1024 });
  attachRobotLink(io, db, fleet);
  await new Promise<void>((resolve) => http.listen(0, "127.0.0.1", resolve));
  const url = `http://127.0.0.1:${(http.address() as AddressInfo).port}`;
  return {
    url,
    db,
    fleet,
    async addRobot(opts = {}) {
      counter += 1;
      const id = `it-${process.pid}-${Date.now() % 100000}-${counter}`;
      const key = generateRobotKey();
      await db.insert(robots).values({
        id,
        name: opts.name ?? `Probe ${counter}`,
        keyHash: hashRobotKey(key),
        drive: "differential",
        sensors: TEST_SENSORS,
        simulated: opts.simulated ?? false,
      });
      const row = (await db.select().from(robots).where(eq(robots.id, id)).limit(1))[0];
      await fleet.register(row);
      return { id, key };
    },
    async stop() {
      await new Promise<void>((resolve) => io.close(() => resolve()));
      await fleet.stop();
      await closeDb();
    },
  };
}

/** A bare socket.io robot connection for protocol tests: every emit waits for its ack. */
export async function connectRobot(url: string, auth: { robot: string; key: string }): Promise<ClientSocket & { call(event: string, payload: unknown): Promise<Ack> }> {
  const socket = connect(`${url}/robot`, { auth, reconnection: false, transports: ["websocket"] });
  await new Promise<void>((resolve, reject) => {
    socket.once("connect", () => resolve());
    socket.once("connect_error", reject);
  });
  return Object.assign(socket, {
    call: (event: string, payload: unknown) => socket.timeout(5000).emitWithAck(event, payload) as Promise<Ack>,
  });
}

export function helloPayload(seq: number) {
  return { seq, at: Date.now(), protocol: 1, model: "probe", drive: "differential", sensors: TEST_SENSORS };
}
