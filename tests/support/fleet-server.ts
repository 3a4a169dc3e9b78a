/**
 * An in-process Tessera link for integration tests: the real fleet service, robot link
 * (and, on request, the /ops dashboard feed) and MariaDB, without Next (pages are covered
 * by the e2e suite).
 */
import { createServer, type Server as HttpServer } from "node:http";
import type { AddressInfo } from "node:net";
import { eq } from "drizzle-orm";
import { encode } from "next-auth/jwt";
import { Server } from "socket.io";
import { io as connect, type Socket as ClientSocket } from "socket.io-client";
import { closeDb, openDb, type Db } from "../../db/client";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";
import { robots, users } from "../../db/schema";
import { DEMO_SENSORS } from "../../db/seed";
import type { Ack, ServerMessage } from "../../lib/protocol";
import { expect } from "vitest";
import type { SensorSpec } from "../../lib/sensing";
import type { Role } from "../../lib/vocabulary";
import { config, fleetConfig, type FleetConfig } from "../../server/config";
import { Fleet } from "../../server/fleet/fleet";
import { attachOpsFeed } from "../../server/ops-feed";
import { attachRobotLink } from "../../server/robot-link";

/** The demo robots' sensor set: front, left and right rangers and a floor sensor. */
export const TEST_SENSORS: SensorSpec[] = DEMO_SENSORS;

export interface TestServer {
  url: string;
  db: Db;
  fleet: Fleet;
  addRobot(opts?: { simulated?: boolean; name?: string }): Promise<{ id: string; key: string }>;
  stop(): Promise<void>;
}

let counter = 0;

/**
 * `ops: true` also attaches the /ops feed. Its sign-in reads the app's configuration, so
 * DATABASE_URL is pointed at this database and NEXTAUTH_SECRET set unless already set.
 */
export async function startTestServer(databaseUrl: string, overrides: Partial<FleetConfig> = {}, opts: { ops?: boolean } = {}): Promise<TestServer> {
  if (opts.ops) {
    process.env.DATABASE_URL = databaseUrl;
    process.env.NEXTAUTH_SECRET ??= "tessera-integration-secret";
  }
  const db = openDb(databaseUrl);
  const fleet = new Fleet(db, fleetConfig(overrides));
  await fleet.start();
  const http: HttpServer = createServer();
  const io = new Server(http, { maxHttpBufferSize: 64 * 1024 });
  attachRobotLink(io, db, fleet);
  if (opts.ops) attachOpsFeed(io, fleet);
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

/**
 * A robot driven by the test itself over the real link: it answers each `next` only when the
 * test calls `step`, with the readings the test chooses, so a run repeats exactly.
 */
export async function scriptedRobot(server: TestServer) {
  const robot = await server.addRobot({ simulated: true });
  const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
  let seq = 1;
  await socket.call("hello", helloPayload(seq));
  const nexts: ServerMessage["next"][] = [];
  socket.on("next", (m: ServerMessage["next"]) => nexts.push(m));
  let answered = 0;
  return {
    robot,
    socket,
    nexts,
    /** The next seq this robot sends. */
    nextSeq: () => ++seq,
    /** The last seq this robot sent. */
    lastSeq: () => seq,
    /** Waits for the first `next` not yet answered, then reports it carried out (with `odometry` when given) and what it sensed. */
    async step(readings: unknown[], odometry?: { distanceM: number; turnDeg: number }): Promise<ServerMessage["next"]> {
      await expect.poll(() => nexts.length).toBeGreaterThan(answered);
      const next = nexts[answered++];
      await socket.call("moved", { seq: ++seq, at: Date.now(), action: next.action, ...(odometry ? { odometry } : {}) });
      await socket.call("sensed", { seq: ++seq, at: Date.now(), readings });
      return next;
    },
  };
}

export function helloPayload(seq: number) {
  return { seq, at: Date.now(), protocol: 1, model: "probe", drive: "differential", sensors: TEST_SENSORS };
}

/** The Cookie header of a next-auth session for the seeded demo user with `role`, signed with the configured secret. */
export async function sessionCookie(db: Db, role: Role, secret = config().NEXTAUTH_SECRET): Promise<string> {
  const user = (await db.select().from(users).where(eq(users.role, role)).orderBy(users.id).limit(1))[0];
  if (!user) throw new Error(`no ${role} user is seeded`);
  const token = await encode({ token: { sub: String(user.id), uid: String(user.id), email: user.email, name: user.name, role: user.role }, secret });
  return `next-auth.session-token=${token}`;
}

/** A signed-in /ops dashboard socket whose `call` waits for the command's ack. */
export async function connectDashboard(url: string, cookie: string): Promise<ClientSocket & { call(event: string, payload: unknown): Promise<unknown> }> {
  const socket = connect(`${url}/ops`, { reconnection: false, transports: ["websocket"], forceNew: true, extraHeaders: { cookie } });
  await new Promise<void>((resolve, reject) => {
    socket.once("connect", () => resolve());
    socket.once("connect_error", reject);
  });
  return Object.assign(socket, {
    call: (event: string, payload: unknown) => socket.timeout(10_000).emitWithAck(event, payload) as Promise<unknown>,
  });
}

/** One /robot handshake with `auth` against `robotUrl` (the namespace's URL): connected, or the connect_error's data. */
export function tryRobotHandshake(robotUrl: string, auth: Record<string, unknown>): Promise<{ connected: true } | { connected: false; data: unknown }> {
  return new Promise((resolve) => {
    const socket = connect(robotUrl, { auth, reconnection: false, transports: ["websocket"], forceNew: true });
    socket.on("connect", () => {
      socket.close();
      resolve({ connected: true });
    });
    socket.on("connect_error", (err) => {
      socket.close();
      resolve({ connected: false, data: (err as Error & { data?: unknown }).data });
    });
  });
}
