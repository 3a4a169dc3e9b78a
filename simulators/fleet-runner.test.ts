// Simulated robots against a small socket.io server in the test that acknowledges every
// message and lets the test play the fleet service's part (next, hold, release, tune).
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { Server, type Socket as ServerSocket } from "socket.io";
import { afterEach, describe, expect, it } from "vitest";
import { parseFloorplan } from "../lib/floorplan";
import { ROBOT_EVENTS } from "../lib/protocol";
import { formatEvent, parseCommand, parseFleetFile } from "./cli-commands";
import { startFleet, type Fleet, type SimEvent, type SimRobotSpec } from "./fleet-runner";

type Message = { event: keyof typeof ROBOT_EVENTS; body: Record<string, unknown> };

async function startAckingServer(keys: Record<string, string>) {
  const http = createServer();
  const io = new Server(http, { transports: ["websocket"] });
  const messages = new Map<string, Message[]>();
  const sockets = new Map<string, ServerSocket>();
  const lastSeq = new Map<string, number>();
  const hellos = new Map<string, number>();
  const nsp = io.of("/robot");
  nsp.use((socket, next) => {
    const { robot, key } = socket.handshake.auth as { robot: string; key: string };
    if (keys[robot] !== key) return next(Object.assign(new Error("bad_key"), { data: { code: "bad_key" } }));
    socket.data.robot = robot;
    next();
  });
  nsp.on("connection", (socket) => {
    const id = socket.data.robot as string;
    sockets.set(id, socket);
    if (!messages.has(id)) messages.set(id, []);
    for (const event of Object.keys(ROBOT_EVENTS) as (keyof typeof ROBOT_EVENTS)[]) {
      socket.on(event, (body: Record<string, unknown>, ack: (a: unknown) => void) => {
        const parsed = ROBOT_EVENTS[event].safeParse(body);
        if (!parsed.success) {
          ack({ ok: false, seq: null, code: "bad_message", message: parsed.error.issues[0].path.join(".") });
          return;
        }
        const seq = parsed.data.seq;
        if (event === "hello") hellos.set(id, (hellos.get(id) ?? 0) + 1);
        const seen = lastSeq.get(id) ?? 0;
        if (seq <= seen) {
          ack(event === "hello" ? { ok: true, seq, dup: true, lastSeq: seen, state: "idle", mission: null } : { ok: true, seq, dup: true });
          return;
        }
        lastSeq.set(id, seq);
        messages.get(id)!.push({ event, body: parsed.data as Record<string, unknown> });
        ack(event === "hello" ? { ok: true, seq, lastSeq: seq, state: "idle", mission: null } : { ok: true, seq });
      });
    }
  });
  await new Promise<void>((resolve) => http.listen(0, "127.0.0.1", resolve));
  return {
    url: `http://127.0.0.1:${(http.address() as AddressInfo).port}`,
    messages: (id: string) => messages.get(id) ?? [],
    /** Every hello received, repeats included: a reconnect while messages wait resends the previous hello's seq. */
    hellos: (id: string) => hellos.get(id) ?? 0,
    socket: (id: string) => sockets.get(id)!,
    close: () => new Promise<void>((resolve) => io.close(() => resolve())),
  };
}

async function waitFor<T>(probe: () => T | undefined | false, timeoutMs = 6000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error("condition not met in time");
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

// 7 × 9 tiles, a wall stub at (3, 4).
const plan = parseFloorplan(["111111111", "100000001", "100000001", "100010001", "100000001", "100000001", "111111111"].join("\n"));
const SENSORS = [
  { id: "us-front", kind: "range" as const, bearingDeg: 0, maxRangeM: 3 },
  { id: "floor", kind: "floor" as const },
];
const SPECS: SimRobotSpec[] = [
  { id: "sim-wren", key: "k-wren", name: "Wren", drive: "differential", sensors: SENSORS, start: { row: 5, col: 2, heading: "N" } },
  { id: "sim-cart", key: "k-cart", name: "Cart", drive: "bicycle", sensors: SENSORS, start: { row: 5, col: 6, heading: "N" } },
];

let server: Awaited<ReturnType<typeof startAckingServer>> | null = null;
let fleet: Fleet | null = null;

afterEach(async () => {
  await fleet?.stop();
  await server?.close();
  fleet = null;
  server = null;
});

const after = (list: Message[], from: number) => list.slice(from).filter((m) => m.event !== "beat");

describe("startFleet", () => {
  it("signs every robot in, reports sensed and truth, and carries out next with moved, sensed, truth in that order", async () => {
    server = await startAckingServer({ "sim-wren": "k-wren", "sim-cart": "k-cart" });
    const events: SimEvent[] = [];
    fleet = await startFleet({ url: server.url, robots: SPECS, plan, seed: 7, timeScale: 25, onEvent: (e) => events.push(e), link: { beatIntervalMs: 200 } });
    expect([...fleet.robots.keys()]).toEqual(["sim-wren", "sim-cart"]);
    const s = server;
    await waitFor(() => s.messages("sim-wren").some((m) => m.event === "truth") && s.messages("sim-cart").some((m) => m.event === "truth"));
    expect(s.messages("sim-wren")[0]).toMatchObject({ event: "hello", body: { protocol: 1, drive: "differential", sensors: SENSORS } });
    expect(s.messages("sim-wren").find((m) => m.event === "truth")?.body).toMatchObject({ row: 5, col: 2, heading: "N" });

    const mark = s.messages("sim-wren").length;
    s.socket("sim-wren").emit("next", { mission: 3, step: 1, action: "forward" });
    const reply = await waitFor(() => {
      const list = after(s.messages("sim-wren"), mark);
      return list.length >= 3 && list;
    });
    expect(reply.slice(0, 3).map((m) => m.event)).toEqual(["moved", "sensed", "truth"]);
    expect(reply[0].body).toMatchObject({ action: "forward" });
    expect((reply[0].body.odometry as { distanceM: number }).distanceM).toBeCloseTo(plan.tileM, 2);
    expect(reply[1].body.readings).toHaveLength(2);
    expect(reply[2].body).toMatchObject({ row: 4, col: 2, heading: "N" });

    const cartMark = s.messages("sim-cart").length;
    s.socket("sim-cart").emit("next", { mission: 4, step: 1, action: "left" });
    const cart = await waitFor(() => after(s.messages("sim-cart"), cartMark).find((m) => m.event === "truth"));
    expect(cart.body).toMatchObject({ row: 4, col: 5, heading: "W" });
    expect(events.some((e) => e.robot === "sim-cart" && e.kind === "moved")).toBe(true);
    expect(fleet.robots.get("sim-cart")!.snapshot().truth).toEqual({ row: 4, col: 5, heading: "W" });
  });

  it("brakes on hold, reports the cut-short move, waits for release before the next step, and ignores a repeated step", async () => {
    server = await startAckingServer({ "sim-wren": "k-wren" });
    fleet = await startFleet({ url: server.url, robots: [SPECS[0]], plan, seed: 8, timeScale: 5 });
    const s = server;
    await waitFor(() => s.messages("sim-wren").some((m) => m.event === "truth"));
    const socket = s.socket("sim-wren");
    const mark = s.messages("sim-wren").length;
    socket.emit("next", { mission: 9, step: 1, action: "forward" });
    await new Promise((resolve) => setTimeout(resolve, 120));
    socket.emit("hold", { reason: "operator", mission: 9 });
    const moved = await waitFor(() => after(s.messages("sim-wren"), mark).find((m) => m.event === "moved"));
    const distance = (moved.body.odometry as { distanceM: number }).distanceM;
    expect(distance).toBeGreaterThan(0);
    expect(distance).toBeLessThan(plan.tileM * 0.8);
    expect(fleet.robots.get("sim-wren")!.snapshot().held).toBe(true);

    const heldMark = s.messages("sim-wren").length;
    socket.emit("next", { mission: 9, step: 2, action: "left" });
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(after(s.messages("sim-wren"), heldMark).filter((m) => m.event === "moved")).toHaveLength(0);
    socket.emit("release", { mission: 9 });
    const turned = await waitFor(() => after(s.messages("sim-wren"), heldMark).find((m) => m.event === "moved"));
    expect(turned.body.action).toBe("left");

    const repeatMark = s.messages("sim-wren").length;
    socket.emit("next", { mission: 9, step: 2, action: "left" });
    await new Promise((resolve) => setTimeout(resolve, 400));
    expect(after(s.messages("sim-wren"), repeatMark).filter((m) => m.event === "moved")).toHaveLength(0);
  });

  it("injects faults: a kidnap is reported as truth, a stall as a fault beat, a drop cuts and restores the link", async () => {
    server = await startAckingServer({ "sim-wren": "k-wren" });
    const events: SimEvent[] = [];
    fleet = await startFleet({ url: server.url, robots: [SPECS[0]], plan, seed: 9, timeScale: 10, link: { beatIntervalMs: 50, reconnectDelayMs: 50 }, onEvent: (e) => events.push(e) });
    const s = server;
    await waitFor(() => s.messages("sim-wren").some((m) => m.event === "truth"));

    expect(fleet.inject("sim-wren", { kind: "kidnap", row: 2, col: 7, heading: "S" })).toEqual({ ok: true });
    const truth = await waitFor(() => s.messages("sim-wren").find((m) => m.event === "truth" && m.body.row === 2));
    expect(truth.body).toMatchObject({ row: 2, col: 7, heading: "S" });
    expect(fleet.inject("sim-wren", { kind: "kidnap", row: 3, col: 4 })).toMatchObject({ ok: false });
    expect(fleet.inject("sim-nobody", { kind: "drain" })).toEqual({ ok: false, reason: "no simulated robot sim-nobody" });

    expect(fleet.inject("sim-wren", { kind: "stall", seconds: 5, wheel: "right" }).ok).toBe(true);
    await waitFor(() => s.messages("sim-wren").find((m) => m.event === "beat" && m.body.fault === "right wheel stalled"));

    expect(fleet.inject("sim-wren", { kind: "drain" }).ok).toBe(true);
    await waitFor(() => s.messages("sim-wren").find((m) => m.event === "beat" && (m.body.battery as number) <= 0.05));

    expect(fleet.inject("sim-wren", { kind: "drop", seconds: 4 }).ok).toBe(true);
    const robot = fleet.robots.get("sim-wren")!;
    await waitFor(() => robot.snapshot().link === "offline");
    expect(robot.snapshot().linkDropped).toBe(true);
    const hellos = s.hellos("sim-wren");
    await waitFor(() => robot.snapshot().link === "online", 3000);
    expect(s.hellos("sim-wren")).toBe(hellos + 1);
    expect(events.filter((e) => e.kind === "fault").map((e) => e.detail.kind)).toEqual(["kidnap", "stall", "drain", "drop"]);
  });

  it("refuses a fleet whose robot starts on a blocked tile", async () => {
    await expect(startFleet({ url: "http://127.0.0.1:9", robots: [{ ...SPECS[0], start: { row: 3, col: 4, heading: "E" } }], plan, seed: 1 })).rejects.toThrow(RangeError);
  });
});

describe("the CLI's text surfaces", () => {
  it("reads the seed's fleet file and names the first wrong field", () => {
    const good = JSON.stringify({ robots: [{ ...SPECS[0] }, { ...SPECS[1], name: undefined }] });
    const parsed = parseFleetFile(good);
    expect(parsed.ok && parsed.robots.map((r) => [r.id, r.name, r.drive])).toEqual([
      ["sim-wren", "Wren", "differential"],
      ["sim-cart", "sim-cart", "bicycle"],
    ]);
    expect(parseFleetFile(JSON.stringify({ robots: [{ ...SPECS[0], drive: "tracked" }] }))).toEqual({ ok: false, reason: "robots[0].drive: expected one of differential, bicycle" });
    expect(parseFleetFile(JSON.stringify({ robots: [SPECS[0], { ...SPECS[1], start: { row: 1, col: 2, heading: "NE" } }] }))).toMatchObject({ ok: false, reason: expect.stringContaining("robots[1].start") });
    expect(parseFleetFile("{robots")).toMatchObject({ ok: false, reason: expect.stringContaining("not JSON") });
  });

  it("parses the fault commands typed on stdin", () => {
    expect(parseCommand("kidnap nx-otter 4 11 w")).toEqual({ kind: "fault", robot: "nx-otter", fault: { kind: "kidnap", row: 4, col: 11, heading: "W" } });
    expect(parseCommand("kidnap nx-otter 4 11")).toEqual({ kind: "fault", robot: "nx-otter", fault: { kind: "kidnap", row: 4, col: 11 } });
    expect(parseCommand("stall nx-kestrel 2.5")).toEqual({ kind: "fault", robot: "nx-kestrel", fault: { kind: "stall", seconds: 2.5 } });
    expect(parseCommand("stall nx-kestrel 3 right")).toEqual({ kind: "fault", robot: "nx-kestrel", fault: { kind: "stall", seconds: 3, wheel: "right" } });
    expect(parseCommand("drop nx-magpie 12")).toEqual({ kind: "fault", robot: "nx-magpie", fault: { kind: "drop", seconds: 12 } });
    expect(parseCommand("  drain nx-badger ")).toEqual({ kind: "fault", robot: "nx-badger", fault: { kind: "drain" } });
    expect(parseCommand("help")).toEqual({ kind: "help" });
    expect(parseCommand("")).toEqual({ kind: "empty" });
    expect(parseCommand("drop nx-magpie -1").kind).toBe("error");
    expect(parseCommand("kidnap nx-otter 4").kind).toBe("error");
    expect(parseCommand("teleport x").kind).toBe("error");
  });

  it("formats one line per event", () => {
    const line = formatEvent({ robot: "nx-otter", kind: "moved", timeS: 12.5, detail: { action: "forward", distanceM: 0.3051, bumped: false, truth: { row: 4, col: 3, heading: "N" } } }, Date.UTC(2025, 0, 2, 9, 8, 7, 654));
    expect(line).toBe('09:08:07.654 nx-otter moved simS=12.5 action=forward distanceM=0.3051 bumped=false truth={"row":4,"col":3,"heading":"N"}');
  });
});
