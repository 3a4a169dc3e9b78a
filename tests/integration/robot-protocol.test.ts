/**
 * The robot link against the real fleet service and MariaDB, clause by clause of
 * PROTOCOL.md: acknowledgements, duplicate and out-of-order seqs, refusals, limits.
 */
import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { events } from "../../db/schema";
import { connectRobot, helloPayload, startTestServer, type TestServer } from "../support/fleet-server";

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { maxErrors: 20, errorWindowMs: 10_000 });
});

afterAll(async () => {
  await server.stop();
});

async function storedCount(robotId: string, seq?: number): Promise<number> {
  const where = seq === undefined ? eq(events.robotId, robotId) : and(eq(events.robotId, robotId), eq(events.seq, seq));
  const [{ n }] = await server.db.select({ n: count() }).from(events).where(where);
  return n;
}

describe("robot link", () => {
  it("answers hello with lastSeq, state and mission, and stores it before the ack", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    const ack = await socket.call("hello", helloPayload(1));
    expect(ack).toEqual({ ok: true, seq: 1, lastSeq: 1, state: "idle", mission: null });
    expect(await storedCount(robot.id, 1)).toBe(1);
    socket.close();
  });

  it("refuses a malformed message with bad_message naming the field, and keeps the connection", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await socket.call("hello", helloPayload(1));
    const ack = await socket.call("beat", { seq: 2, at: Date.now(), battery: 1.7, status: "ok" });
    expect(ack).toMatchObject({ ok: false, seq: 2, code: "bad_message" });
    expect((ack as { message: string }).message).toMatch(/^battery/);
    expect(socket.connected).toBe(true);
    expect(await socket.call("beat", { seq: 2, at: Date.now(), battery: 0.7, status: "ok" })).toEqual({ ok: true, seq: 2 });
    expect(await storedCount(robot.id)).toBe(2);
    socket.close();
  });

  it("applies a seq once: a repeat is acknowledged as dup and stored once", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await socket.call("hello", helloPayload(1));
    const sensed = { seq: 2, at: Date.now(), readings: [{ sensor: "floor", mark: 2 }] };
    expect(await socket.call("sensed", sensed)).toEqual({ ok: true, seq: 2 });
    const before = Float64Array.from(server.fleet.robots.get(robot.id)!.filter.belief);
    expect(await socket.call("sensed", sensed)).toEqual({ ok: true, seq: 2, dup: true });
    expect(Array.from(server.fleet.robots.get(robot.id)!.filter.belief)).toEqual(Array.from(before));
    expect(await storedCount(robot.id, 2)).toBe(1);
    socket.close();
  });

  it("refuses a lower seq that was never applied with out_of_order", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await socket.call("hello", helloPayload(1));
    expect(await socket.call("beat", { seq: 5, at: Date.now(), battery: 0.9, status: "ok" })).toEqual({ ok: true, seq: 5 });
    expect(await socket.call("beat", { seq: 3, at: Date.now(), battery: 0.9, status: "ok" })).toMatchObject({ ok: false, seq: 3, code: "out_of_order" });
    socket.close();
  });

  it("answers a rebooted robot's stale hello with lastSeq so it can continue", async () => {
    const robot = await server.addRobot();
    const first = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await first.call("hello", helloPayload(1));
    await first.call("beat", { seq: 2, at: Date.now(), battery: 0.9, status: "ok" });
    await first.call("beat", { seq: 3, at: Date.now(), battery: 0.9, status: "ok" });
    first.close();
    const rebooted = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    expect(await rebooted.call("hello", helloPayload(1))).toMatchObject({ ok: true, seq: 1, dup: true, lastSeq: 3 });
    expect(await rebooted.call("hello", helloPayload(4))).toMatchObject({ ok: true, seq: 4, lastSeq: 4 });
    rebooted.close();
  });

  it("accepts truth only from simulated robots, and stores nothing of a refused one", async () => {
    const hardware = await server.addRobot({ simulated: false });
    const sim = await server.addRobot({ simulated: true });
    const hw = await connectRobot(server.url, { robot: hardware.id, key: hardware.key });
    const sm = await connectRobot(server.url, { robot: sim.id, key: sim.key });
    await hw.call("hello", helloPayload(1));
    await sm.call("hello", helloPayload(1));
    const truth = { seq: 2, at: Date.now(), row: 10, col: 3, heading: "E" };
    expect(await hw.call("truth", truth)).toMatchObject({ ok: false, code: "bad_message", message: expect.stringMatching(/simulated/) });
    expect(await sm.call("truth", truth)).toEqual({ ok: true, seq: 2 });
    expect(await storedCount(hardware.id, 2)).toBe(0);
    expect(await storedCount(hardware.id)).toBe(1);
    expect(server.fleet.robots.get(hardware.id)!.lastTruth).toBeNull();
    expect(await storedCount(sim.id, 2)).toBe(1);
    // The refused seq was never applied: the robot may use it for its next real message.
    expect(await hw.call("beat", { seq: 2, at: Date.now(), battery: 0.9, status: "ok" })).toEqual({ ok: true, seq: 2 });
    hw.close();
    sm.close();
  });

  it("refuses moved without a mission with no_mission", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await socket.call("hello", helloPayload(1));
    expect(await socket.call("moved", { seq: 2, at: Date.now(), action: "forward" })).toMatchObject({ ok: false, code: "no_mission" });
    socket.close();
  });

  it("refuses an oversized message with too_large and an unknown event with bad_message", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await socket.call("hello", helloPayload(1));
    const readings = Array.from({ length: 30 }, (_, i) => ({ sensor: `s${i}`.padEnd(32, "x"), rangeM: 1 }));
    const big = { seq: 2, at: Date.now(), readings, pad: "x".repeat(20_000) };
    expect(await socket.call("sensed", big)).toMatchObject({ ok: false, code: "too_large" });
    expect(await socket.call("teleport", { seq: 2, at: Date.now() })).toMatchObject({ ok: false, code: "bad_message", message: expect.stringMatching(/unknown event/) });
    socket.close();
  });

  it("ends the connection after 20 refused messages within 10 s", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await socket.call("hello", helloPayload(1));
    const closed = new Promise<string>((resolve) => socket.once("too_many_errors", (p: { reason: string }) => resolve(p.reason)));
    for (let i = 0; i < 19; i++) {
      expect(await socket.call("beat", { seq: 2, at: Date.now(), battery: "full", status: "ok" })).toMatchObject({ code: "bad_message" });
    }
    expect(socket.connected).toBe(true);
    socket.emit("beat", { seq: 2, at: Date.now(), battery: "full", status: "ok" }, () => {});
    expect(await closed).toBe("too_many_errors");
    await new Promise<void>((resolve) => (socket.connected ? socket.once("disconnect", () => resolve()) : resolve()));
    expect(socket.connected).toBe(false);
  });

  it("loses nothing and applies nothing twice when a robot resends after a reconnect", async () => {
    const robot = await server.addRobot();
    const first = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    await first.call("hello", helloPayload(1));
    const sent = [2, 3, 4, 5, 6].map((seq) => ({ seq, at: Date.now(), readings: [{ sensor: "us-front", rangeM: 0.3 + seq / 10 }] }));
    for (const m of sent.slice(0, 3)) await first.call("sensed", m);
    first.close();
    // The robot saw no ack for 3 and 4 and had queued 5 and 6: after a fresh hello it resends 3..6 in order.
    const second = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    expect(await second.call("hello", helloPayload(7))).toMatchObject({ ok: true, lastSeq: 7 });
    const acks = [];
    for (const m of sent.slice(1)) acks.push(await second.call("sensed", m));
    expect(acks).toEqual([
      { ok: true, seq: 3, dup: true },
      { ok: true, seq: 4, dup: true },
      { ok: true, seq: 5 },
      { ok: true, seq: 6 },
    ]);
    for (const seq of [2, 3, 4, 5, 6, 7]) expect(await storedCount(robot.id, seq)).toBe(1);
    second.close();
  });

  it("batches the writes of 50 robots into few transactions", async () => {
    const fleetRobots = await Promise.all(Array.from({ length: 50 }, () => server.addRobot()));
    const sockets = await Promise.all(fleetRobots.map((r) => connectRobot(server.url, { robot: r.id, key: r.key })));
    await Promise.all(sockets.map((s) => s.call("hello", helloPayload(1))));
    const before = { ...server.fleet.writer.stats };
    await Promise.all(sockets.flatMap((s) => [2, 3, 4, 5, 6].map((seq) => s.call("beat", { seq, at: Date.now(), battery: 0.8, status: "ok" }))));
    const events = server.fleet.writer.stats.events - before.events;
    const batches = server.fleet.writer.stats.batches - before.batches;
    expect(events).toBe(250);
    // Each robot's messages are applied in turn, each after the commit of the one before: five rounds of 50.
    expect(batches).toBeLessThanOrEqual(25);
    sockets.forEach((s) => s.close());
  });
});
