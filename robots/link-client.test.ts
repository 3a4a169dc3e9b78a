// The robot link client against a small socket.io server in the test that acknowledges as
// PROTOCOL.md says: dup for a seen seq, out_of_order for an unseen seq below the highest
// applied one, hello always answered with lastSeq.
import { mkdtempSync, rmSync } from "node:fs";
import { createServer, type Server as HttpServer } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Server, type Socket as ServerSocket } from "socket.io";
import { afterEach, describe, expect, it } from "vitest";
import { ROBOT_EVENTS, type Ack, type ServerMessage } from "../lib/protocol";
import type { AckCode } from "../lib/vocabulary";
import { createRobotClient, fileSeqStore, LinkStoppedError, memorySeqStore, type RobotClient, type RobotClientOptions } from "./link-client";

type EventName = keyof typeof ROBOT_EVENTS;
interface Arrival {
  event: EventName;
  seq: number;
  connection: number;
}
/** What the test server does with one arriving message before the protocol rules. */
type Intercept = "swallow" | "swallow-and-kick" | "apply-then-kick" | "drop-transport" | { refuse: AckCode };

interface FakeRobot {
  key: string;
  seen: Set<number>;
  lastSeq: number;
  applied: { event: EventName; seq: number; payload: Record<string, unknown> }[];
  arrivals: Arrival[];
  socket: ServerSocket | null;
}

interface FakeServer {
  url: string;
  robots: Map<string, FakeRobot>;
  handshakes: () => number;
  addRobot(id: string, key: string, history?: number[]): FakeRobot;
  intercept: (robot: string, event: EventName, seq: number, arrivalCount: number) => Intercept | undefined;
  close(): Promise<void>;
}

async function startFakeServer(): Promise<FakeServer> {
  const http: HttpServer = createServer();
  const io = new Server(http, { transports: ["websocket"] });
  const robots = new Map<string, FakeRobot>();
  let handshakes = 0;
  let connections = 0;
  const server: FakeServer = {
    url: "",
    robots,
    handshakes: () => handshakes,
    addRobot(id, key, history = []) {
      const robot: FakeRobot = { key, seen: new Set(history), lastSeq: Math.max(0, ...history), applied: [], arrivals: [], socket: null };
      robots.set(id, robot);
      return robot;
    },
    intercept: () => undefined,
    close: () =>
      new Promise((resolve) => {
        io.close(() => resolve());
      }),
  };
  const nsp = io.of("/robot");
  nsp.use((socket, next) => {
    handshakes += 1;
    const auth = socket.handshake.auth as { robot?: string; key?: string };
    const robot = robots.get(auth.robot ?? "");
    const refuse = (code: string) => next(Object.assign(new Error(code), { data: { code } }));
    if (!robot) return refuse("unknown_robot");
    if (robot.key !== auth.key) return refuse("bad_key");
    socket.data.robot = auth.robot;
    next();
  });
  nsp.on("connection", (socket) => {
    const id = socket.data.robot as string;
    const robot = robots.get(id)!;
    const connection = ++connections;
    if (robot.socket) {
      robot.socket.emit("replaced");
      robot.socket.disconnect(true);
    }
    robot.socket = socket;
    for (const event of Object.keys(ROBOT_EVENTS) as EventName[]) {
      socket.on(event, (raw: Record<string, unknown>, ack: (a: Ack) => void) => {
        const parsed = ROBOT_EVENTS[event].safeParse(raw);
        const seq = typeof raw?.seq === "number" ? raw.seq : null;
        if (!parsed.success || seq === null) {
          ack({ ok: false, seq, code: "bad_message", message: parsed.success ? "seq" : parsed.error.issues[0].path.join(".") });
          return;
        }
        robot.arrivals.push({ event, seq, connection });
        const count = robot.arrivals.filter((a) => a.seq === seq && a.event === event).length;
        const rule = server.intercept(id, event, seq, count);
        if (rule === "swallow") return;
        if (rule === "swallow-and-kick") {
          socket.disconnect(true);
          return;
        }
        if (rule === "drop-transport") {
          socket.conn.close();
          return;
        }
        const state = { state: "idle" as const, mission: null };
        if (robot.seen.has(seq)) {
          ack(event === "hello" ? { ok: true, seq, dup: true, lastSeq: robot.lastSeq, ...state } : { ok: true, seq, dup: true });
          return;
        }
        if (seq < robot.lastSeq) {
          ack({ ok: false, seq, code: "out_of_order", message: "seq below the last applied", lastSeq: robot.lastSeq });
          return;
        }
        if (rule && typeof rule === "object") {
          ack({ ok: false, seq, code: rule.refuse, message: `refused: ${rule.refuse}` });
          return;
        }
        robot.seen.add(seq);
        robot.lastSeq = seq;
        robot.applied.push({ event, seq, payload: parsed.data as Record<string, unknown> });
        if (rule === "apply-then-kick") {
          socket.disconnect(true);
          return;
        }
        ack(event === "hello" ? { ok: true, seq, lastSeq: robot.lastSeq, ...state } : { ok: true, seq });
      });
    }
  });
  await new Promise<void>((resolve) => http.listen(0, "127.0.0.1", resolve));
  server.url = `http://127.0.0.1:${(http.address() as AddressInfo).port}`;
  return server;
}

async function waitFor(condition: () => boolean, timeoutMs = 4000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > deadline) throw new Error("condition not met in time");
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

const HELLO = { model: "test base", drive: "differential" as const, sensors: [{ id: "us-front", kind: "range" as const, bearingDeg: 0, maxRangeM: 3 }] };

let server: FakeServer;
const clients: RobotClient[] = [];
const dirs: string[] = [];

function client(overrides: Partial<RobotClientOptions> & { robotId: string; key: string }): RobotClient {
  const c = createRobotClient({ url: server.url, hello: HELLO, beatIntervalMs: 60_000, ackTimeoutMs: 300, reconnectDelayMs: 50, reconnectDelayMaxMs: 200, ...overrides });
  clients.push(c);
  return c;
}

const movedOf = (n: number) => ({ action: "forward" as const, odometry: { distanceM: 0.3 + n / 1000, turnDeg: n / 10 } });
const appliedMoves = (robot: FakeRobot) => robot.applied.filter((a) => a.event === "moved");

async function setup() {
  server = await startFakeServer();
}

afterEach(async () => {
  for (const c of clients.splice(0)) c.close();
  for (const dir of dirs.splice(0)) rmSync(dir, { recursive: true, force: true });
  await server?.close();
});

describe("createRobotClient", () => {
  it("sends hello first, then every message once, in order, under strictly increasing seqs", async () => {
    await setup();
    const robot = server.addRobot("rb-a", "k-a");
    const c = client({ robotId: "rb-a", key: "k-a" });
    const acks = await Promise.all([c.send("moved", movedOf(1)), c.send("sensed", { readings: [{ sensor: "us-front", rangeM: 1.25 }] }), c.send("truth", { row: 3, col: 7, heading: "W" })]);
    expect(acks.every((a) => a.ok)).toBe(true);
    expect(robot.arrivals[0].event).toBe("hello");
    const hello = robot.applied[0].payload;
    expect(hello).toMatchObject({ protocol: 1, model: "test base", drive: "differential" });
    const seqs = robot.arrivals.map((a) => a.seq);
    for (let i = 1; i < seqs.length; i++) expect(seqs[i]).toBeGreaterThan(seqs[i - 1]);
    expect(robot.applied.filter((a) => a.event !== "beat").map((a) => a.event)).toEqual(["hello", "moved", "sensed", "truth"]);
    expect(robot.applied.find((a) => a.event === "truth")?.payload).toMatchObject({ row: 3, col: 7, heading: "W" });
    expect(c.state).toBe("online");
    await waitFor(() => c.pending === 0);
  });

  it("after a server-side disconnect whose ack was lost, re-sends in order after the hello: nothing lost, nothing applied twice", async () => {
    await setup();
    const robot = server.addRobot("rb-b", "k-b");
    const c = client({ robotId: "rb-b", key: "k-b" });
    await waitFor(() => c.state === "online");
    let kicked = false;
    server.intercept = (_id, event, _seq, count) => {
      if (event === "moved" && !kicked && appliedMoves(robot).length === 2 && count === 1) {
        kicked = true;
        return "apply-then-kick";
      }
      return undefined;
    };
    const sends = [1, 2, 3, 4, 5, 6].map((n) => c.send("moved", movedOf(n)));
    const acks = await Promise.all(sends);
    expect(kicked).toBe(true);
    expect(acks.every((a) => a.ok)).toBe(true);
    // The third message was applied, its ack lost with the connection: the re-send is a dup.
    expect(acks.map((a) => a.ok && a.dup === true)).toEqual([false, false, true, false, false, false]);
    expect(appliedMoves(robot).map((a) => (a.payload.odometry as { turnDeg: number }).turnDeg)).toEqual([0.1, 0.2, 0.3, 0.4, 0.5, 0.6]);
    const applied = robot.applied.map((a) => a.seq);
    for (let i = 1; i < applied.length; i++) expect(applied[i]).toBeGreaterThan(applied[i - 1]);
    const second = robot.arrivals.filter((a) => a.connection === 2);
    expect(second[0].event).toBe("hello");
    expect(second.filter((a) => a.event === "moved").map((a) => a.seq)).toEqual(acks.slice(2).map((a) => a.seq));
  });

  it("after a transport drop of an unacknowledged message, the manager reconnects and the message arrives once", async () => {
    await setup();
    const robot = server.addRobot("rb-c", "k-c");
    const states: string[] = [];
    const c = client({ robotId: "rb-c", key: "k-c", onState: (s) => states.push(s) });
    await waitFor(() => c.state === "online");
    server.intercept = (_id, event, _seq, count) => (event === "sensed" && count === 1 ? "drop-transport" : undefined);
    const first = c.send("moved", movedOf(7));
    const second = c.send("sensed", { readings: [{ sensor: "us-front", rangeM: 0.75 }] });
    const third = c.send("moved", movedOf(8));
    const acks = await Promise.all([first, second, third]);
    expect(acks.map((a) => a.ok)).toEqual([true, true, true]);
    expect(states).toContain("offline");
    expect(robot.applied.filter((a) => a.event !== "beat" && a.event !== "hello").map((a) => a.event)).toEqual(["moved", "sensed", "moved"]);
    expect(robot.arrivals.filter((a) => a.event === "sensed")).toHaveLength(2);
  });

  it("keeps seq rising across a reconnect, and across a reboot that lost its counter (uses the hello ack's lastSeq)", async () => {
    await setup();
    const robot = server.addRobot("rb-d", "k-d");
    const before = client({ robotId: "rb-d", key: "k-d" });
    await Promise.all([before.send("moved", movedOf(1)), before.send("moved", movedOf(2)), before.send("moved", movedOf(3))]);
    const highest = robot.lastSeq;
    expect(highest).toBeGreaterThanOrEqual(4);
    before.close();

    // A fresh, empty counter: the queued message must not reuse a seq the server has seen.
    const rebooted = client({ robotId: "rb-d", key: "k-d", seqStore: memorySeqStore() });
    const ack = await rebooted.send("moved", movedOf(9));
    expect(ack).toMatchObject({ ok: true, seq: highest + 1 });
    expect(ack.ok && ack.dup).toBeFalsy();
    expect(appliedMoves(robot).map((a) => a.seq)).toEqual([2, 3, 4, highest + 1]);
    expect(rebooted.lastSeq).toBeGreaterThanOrEqual(highest + 1);
  });

  it("re-sends its hello past lastSeq when the hello itself is refused as out of order", async () => {
    await setup();
    // The server applied seq 40 from an earlier life but never saw 1..39.
    const robot = server.addRobot("rb-e", "k-e", [40]);
    const c = client({ robotId: "rb-e", key: "k-e", seqStore: memorySeqStore() });
    const ack = await c.send("truth", { row: 2, col: 5, heading: "S" });
    expect(robot.arrivals.slice(0, 2).map((a) => [a.event, a.seq])).toEqual([
      ["hello", 1],
      ["hello", 41],
    ]);
    expect(ack).toMatchObject({ ok: true, seq: 42 });
  });

  it("reports refusals other than internal/rate_limited as final and retries internal ones", async () => {
    await setup();
    const robot = server.addRobot("rb-f", "k-f");
    server.intercept = (_id, event, _seq, count) => {
      if (event === "moved") return { refuse: "no_mission" };
      if (event === "sensed" && count === 1) return { refuse: "internal" };
      return undefined;
    };
    const c = client({ robotId: "rb-f", key: "k-f" });
    const [moved, sensed, truth] = await Promise.all([
      c.send("moved", movedOf(4)),
      c.send("sensed", { readings: [{ sensor: "floor", mark: 3 }] }),
      c.send("truth", { row: 1, col: 1, heading: "N" }),
    ]);
    expect(moved).toMatchObject({ ok: false, code: "no_mission" });
    expect(robot.arrivals.filter((a) => a.event === "moved")).toHaveLength(1);
    expect(sensed).toMatchObject({ ok: true });
    expect(robot.arrivals.filter((a) => a.event === "sensed")).toHaveLength(2);
    expect(truth.ok).toBe(true);
    expect(robot.applied.filter((a) => a.event === "sensed")).toHaveLength(1);
  });

  it("sends the same message again when its ack does not come in time", async () => {
    await setup();
    const robot = server.addRobot("rb-g", "k-g");
    server.intercept = (_id, event, _seq, count) => (event === "moved" && count === 1 ? "swallow" : undefined);
    const c = client({ robotId: "rb-g", key: "k-g" });
    const ack = await c.send("moved", movedOf(5));
    expect(ack.ok).toBe(true);
    expect(robot.arrivals.filter((a) => a.event === "moved").map((a) => a.seq)).toEqual([ack.seq, ack.seq]);
    expect(appliedMoves(robot)).toHaveLength(1);
  });

  it("stops for good on bad_key and rejects waiting sends", async () => {
    await setup();
    server.addRobot("rb-h", "right-key");
    const states: string[] = [];
    const c = client({ robotId: "rb-h", key: "wrong-key", onState: (s) => states.push(s) });
    const sent = c.send("moved", movedOf(1));
    await expect(sent).rejects.toBeInstanceOf(LinkStoppedError);
    expect(c.state).toBe("refused");
    expect(c.refusal).toBe("bad_key");
    await new Promise((resolve) => setTimeout(resolve, 400));
    expect(server.handshakes()).toBe(1);
    expect(states).toEqual(["refused"]);
  });

  it("exposes unknown_robot the same way", async () => {
    await setup();
    const c = client({ robotId: "rb-nobody", key: "x" });
    await waitFor(() => c.state === "refused");
    expect(c.refusal).toBe("unknown_robot");
  });

  it("gives way when a second connection for the same robot replaces it", async () => {
    await setup();
    server.addRobot("rb-i", "k-i");
    const first = client({ robotId: "rb-i", key: "k-i" });
    await waitFor(() => first.state === "online");
    const second = client({ robotId: "rb-i", key: "k-i", seqStore: memorySeqStore(first.lastSeq) });
    await waitFor(() => second.state === "online" && first.state === "replaced");
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(first.state).toBe("replaced");
    expect(second.state).toBe("online");
    await expect(first.send("moved", movedOf(1))).rejects.toMatchObject({ code: "replaced" });
  });

  it("hands valid server events to their handlers and drops malformed ones", async () => {
    await setup();
    const robot = server.addRobot("rb-j", "k-j");
    const nexts: ServerMessage["next"][] = [];
    const tunes: ServerMessage["tune"][] = [];
    const c = client({ robotId: "rb-j", key: "k-j", onNext: (m) => nexts.push(m), onTune: (m) => tunes.push(m) });
    await waitFor(() => c.state === "online");
    robot.socket!.emit("next", { mission: 12, step: 3, action: "sideways" });
    robot.socket!.emit("next", { mission: 12, step: 3, action: "left" });
    robot.socket!.emit("tune", { pid: { kp: 4.5, ki: 0.25, kd: 0.05 } });
    await waitFor(() => nexts.length === 1 && tunes.length === 1);
    expect(nexts[0]).toEqual({ mission: 12, step: 3, action: "left" });
    expect(tunes[0].pid).toEqual({ kp: 4.5, ki: 0.25, kd: 0.05 });
  });

  it("keeps messages through pause and resume and heartbeats while signed in", async () => {
    await setup();
    const robot = server.addRobot("rb-k", "k-k");
    const c = client({ robotId: "rb-k", key: "k-k", beatIntervalMs: 50, status: () => ({ battery: 0.62, status: "fault", fault: "left wheel stalled" }) });
    await waitFor(() => robot.applied.filter((a) => a.event === "beat").length >= 2);
    expect(robot.applied.find((a) => a.event === "beat")?.payload).toMatchObject({ battery: 0.62, status: "fault", fault: "left wheel stalled" });
    c.pause();
    await waitFor(() => c.state === "offline");
    const queued = c.send("moved", movedOf(3));
    await new Promise((resolve) => setTimeout(resolve, 150));
    expect(appliedMoves(robot)).toHaveLength(0);
    c.resume();
    expect((await queued).ok).toBe(true);
    expect(appliedMoves(robot)).toHaveLength(1);
  });
});

describe("fileSeqStore", () => {
  it("reads 0 when missing and keeps the last seq across instances (a bridge restart)", async () => {
    const dir = mkdtempSync(join(tmpdir(), "tessera-seq-"));
    dirs.push(dir);
    const path = join(dir, "seq");
    expect(fileSeqStore(path).load()).toBe(0);
    fileSeqStore(path).save(317);
    expect(fileSeqStore(path).load()).toBe(317);

    await setup();
    const robot = server.addRobot("rb-l", "k-l");
    const first = client({ robotId: "rb-l", key: "k-l", seqStore: fileSeqStore(path) });
    const ack = await first.send("moved", movedOf(1));
    expect(ack.seq).toBeGreaterThan(317);
    first.close();
    const again = client({ robotId: "rb-l", key: "k-l", seqStore: fileSeqStore(path) });
    const later = await again.send("moved", movedOf(2));
    expect(later.seq).toBeGreaterThan(ack.seq!);
    expect(robot.arrivals.filter((a) => a.event === "hello").map((a) => a.seq)[1]).toBeGreaterThan(ack.seq!);
  });
});
