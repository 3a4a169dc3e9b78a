/**
 * Missions end to end with simulated robots (continuous physics, noisy sensors) over the
 * real link, fleet service and MariaDB, on the demo floor.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { desc, eq, inArray } from "drizzle-orm";
import { alerts, missions } from "../../db/schema";
import { DEMO_FLOORPLAN_FILE } from "../../db/seed";
import { parseFloorplan } from "../../lib/floorplan";
import { HEADINGS } from "../../lib/vocabulary";
import { startFleet } from "../../simulators/fleet-runner";
import type { ServerMessage } from "../../lib/protocol";
import { connectRobot, helloPayload, scriptedRobot, startTestServer, TEST_SENSORS, type TestServer } from "../support/fleet-server";

const plan = parseFloorplan(readFileSync(DEMO_FLOORPLAN_FILE, "utf8"));
const actor = { userId: null, label: "test" };
let server: TestServer;

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { heartbeatTimeoutMs: 5000, trafficReplanMs: 3000 });
});

afterAll(async () => {
  await server.stop();
});

async function simulated(start: { row: number; col: number; heading: "N" | "E" | "S" | "W" }, seed: number, timeScale = 25) {
  const robot = await server.addRobot({ simulated: true });
  const fleet = await startFleet({
    url: server.url,
    plan,
    seed,
    timeScale,
    robots: [{ ...robot, name: robot.id, drive: "differential", sensors: TEST_SENSORS, start }],
  });
  await expect.poll(() => server.fleet.robots.get(robot.id)?.online, { timeout: 5000 }).toBe(true);
  return { robot, fleet, runtime: () => server.fleet.robots.get(robot.id)! };
}

describe("simulated missions", { timeout: 120_000 }, () => {
  it("reaches its goal from an unknown start (uniform belief) within a bounded number of steps", async () => {
    const { robot, fleet, runtime } = await simulated({ row: 13, col: 3, heading: "E" }, 7);
    try {
      expect(runtime().certainty().tileMass).toBeLessThan(0.2);
      const mission = await server.fleet.dispatch(robot.id, { row: 10, col: 26 }, actor);
      await expect.poll(() => runtime().lastOutcome?.outcome, { timeout: 60_000, interval: 200 }).toBe("reached");
      const truth = runtime().lastTruth!;
      const c = runtime().certainty();
      // Localisation error at arrival, in tiles (Manhattan), estimate against the simulator's truth.
      const errorTiles = Math.abs(truth.row - c.row) + Math.abs(truth.col - c.col);
      console.log(`mission ${mission.id}: arrived after ${runtime().certaintyHistory.length} sensed steps, localisation error ${errorTiles} tiles`);
      expect(Math.abs(truth.row - 10) + Math.abs(truth.col - 26)).toBeLessThanOrEqual(1);
      expect(errorTiles).toBeLessThanOrEqual(1);
    } finally {
      await fleet.stop();
    }
  });

  it("holds a robot whose readings stop matching its belief, and releases it on a re-locate", async () => {
    // A scripted robot, so the drop in certainty is repeatable: from its first step it reports
    // the readings of a closet it is not in, as a kidnapped robot would.
    const scripted = await scriptedRobot(server);
    const { robot } = scripted;
    const runtime = () => server.fleet.robots.get(robot.id)!;
    await server.fleet.relocate(robot.id, { row: 10, col: 20, heading: "W" }, actor);
    await server.fleet.dispatch(robot.id, { row: 10, col: 2 }, actor);
    const closet = [
      { sensor: "us-front", rangeM: 0.15 },
      { sensor: "us-left", rangeM: 0.15 },
      { sensor: "us-right", rangeM: 0.15 },
      { sensor: "floor", mark: 4 },
    ];
    for (let step = 0; step < 12 && runtime().hold === null; step++) await scripted.step(closet);
    expect(runtime().hold).toBe("low_certainty");
    expect(runtime().certainty().tileMass).toBeLessThan(0.3);
    await server.fleet.relocate(robot.id, { row: 10, col: 19, heading: "W" }, actor);
    expect(runtime().hold).toBeNull();
    expect(runtime().certainty()).toMatchObject({ row: 10, col: 19, tileMass: 1 });
    await server.fleet.cancel(robot.id, actor);
    scripted.socket.close();
  });
  it("holds a robot whose moves do not move it, with reason fault, and goes on after an operator's release", async () => {
    // A scripted robot that reports each forward with a millimetre of encoder travel, as one
    // pushing against a box the map does not show would. It runs along row 13, clear of the
    // corridor tile (10, 19) where the previous test's robot was left standing.
    const scripted = await scriptedRobot(server);
    const { robot } = scripted;
    const runtime = () => server.fleet.robots.get(robot.id)!;
    await server.fleet.relocate(robot.id, { row: 13, col: 20, heading: "W" }, actor);
    const mission = await server.fleet.dispatch(robot.id, { row: 13, col: 2 }, actor);
    const wedged = { distanceM: 0.001, turnDeg: 0 };
    for (let step = 0; step < 2; step++) expect((await scripted.step([], wedged)).action).toBe("forward");
    expect(runtime().hold).toBeNull();
    await scripted.step([], wedged);
    await expect.poll(() => runtime().hold).toBe("fault");
    // The belief stayed where the robot is, rather than following the forwards it was sent.
    expect(runtime().certainty()).toMatchObject({ row: 13, col: 20, heading: HEADINGS.indexOf("W") });
    const lastAlert = async () => (await server.db.select().from(alerts).where(eq(alerts.robotId, robot.id)).orderBy(desc(alerts.id)).limit(1))[0];
    await expect.poll(async () => (await lastAlert())?.message).toContain("its last 3 moves did not move it");
    const sent = scripted.nexts.length;
    await server.fleet.release(robot.id, actor);
    await expect.poll(() => scripted.nexts.length).toBeGreaterThan(sent);
    expect(runtime().mission?.id).toBe(mission.id);
    await server.fleet.cancel(robot.id, actor);
    scripted.socket.close();
  });

  it("fuses a reading that crosses a `next` on the wire without sending the robot another step", async () => {
    // A robot's idle reading can leave before the `next` of a fresh dispatch reaches it. The
    // server must still wait for that step's `moved`: a second `next` would queue behind the
    // first and leave the robot one action behind every later choice.
    const scripted = await scriptedRobot(server);
    const { robot } = scripted;
    await server.fleet.relocate(robot.id, { row: 13, col: 5, heading: "E" }, actor);
    await server.fleet.dispatch(robot.id, { row: 13, col: 20 }, actor);
    await expect.poll(() => scripted.nexts.length, { timeout: 10_000 }).toBeGreaterThan(0);
    const readings = [{ sensor: "floor", mark: 0 }];
    expect(await scripted.socket.call("sensed", { seq: scripted.nextSeq(), at: Date.now(), readings })).toMatchObject({ ok: true });
    await new Promise((resolve) => setTimeout(resolve, 500));
    // Step 1 may come twice (the server re-issues a pending step shortly after a hello), never step 2.
    expect(new Set(scripted.nexts.map((n) => n.step))).toEqual(new Set([1]));
    expect((await scripted.step(readings)).step).toBe(1);
    await expect.poll(() => scripted.nexts.at(-1)?.step).toBe(2);
    expect(scripted.nexts.filter((n) => n.step === 2)).toHaveLength(1);
    await server.fleet.cancel(robot.id, actor);
    scripted.socket.close();
  });

  it("sends a step again to a robot that reconnects with its earlier hello seq, so a `next` lost in the drop is not waited for forever", async () => {
    // A robot whose link drops with messages still unsent keeps its hello's seq (PROTOCOL.md:
    // hello is the resync point even when seen before); a `next` sent as the link dropped never arrived.
    const scripted = await scriptedRobot(server);
    const { robot } = scripted;
    await server.fleet.relocate(robot.id, { row: 13, col: 5, heading: "E" }, actor);
    await server.fleet.dispatch(robot.id, { row: 13, col: 20 }, actor);
    // The policy is solved before the first step leaves; a loaded machine can take seconds.
    await expect.poll(() => scripted.nexts.length, { timeout: 10_000 }).toBeGreaterThan(0);
    // The first hello's own resume has passed, so only the second hello can bring the step back.
    await expect.poll(() => server.fleet.robots.get(robot.id)?.resumeAt, { timeout: 5000 }).toBeNull();
    scripted.socket.close();
    const again = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    const nexts: ServerMessage["next"][] = [];
    again.on("next", (m: ServerMessage["next"]) => nexts.push(m));
    expect(await again.call("hello", helloPayload(1))).toMatchObject({ ok: true, seq: 1, dup: true });
    await expect.poll(() => nexts.map((n) => n.step), { timeout: 3000 }).toEqual([1]);
    const seq = scripted.lastSeq();
    expect(await again.call("moved", { seq: seq + 1, at: Date.now(), action: nexts[0].action })).toMatchObject({ ok: true });
    expect(await again.call("sensed", { seq: seq + 2, at: Date.now(), readings: [{ sensor: "floor", mark: 0 }] })).toMatchObject({ ok: true });
    await expect.poll(() => nexts.at(-1)?.step).toBe(2);
    await server.fleet.cancel(robot.id, actor);
    again.close();
  });

  type Pose = { row: number; col: number; heading: "N" | "E" | "S" | "W" };
  type Leg = { start: Pose; goal: { row: number; col: number }; seed: number; timeScale?: number };

  /** Sends two simulated robots to their goals at once; returns their ids and every tile they were ever both on. */
  async function bothReach(a: Leg, b: Leg): Promise<{ ids: string[]; shared: string[] }> {
    const sims = [await simulated(a.start, a.seed, a.timeScale), await simulated(b.start, b.seed, b.timeScale)];
    const shared: string[] = [];
    const watch = setInterval(() => {
      const [p, q] = sims.map((sim) => sim.runtime().lastTruth);
      if (p && q && p.row === q.row && p.col === q.col) shared.push(`(${p.row}, ${p.col})`);
    }, 5);
    try {
      const legs = [a, b];
      for (const [i, sim] of sims.entries()) await server.fleet.relocate(sim.robot.id, legs[i].start, actor);
      for (const [i, sim] of sims.entries()) await server.fleet.dispatch(sim.robot.id, legs[i].goal, actor);
      await expect.poll(() => sims.map((sim) => sim.runtime().lastOutcome?.outcome), { timeout: 90_000, interval: 200 }).toEqual(["reached", "reached"]);
      return { ids: sims.map((sim) => sim.robot.id), shared };
    } finally {
      clearInterval(watch);
      for (const sim of sims) await sim.fleet.stop();
    }
  }

  it("lets two robots cross in the corridor without ever standing on the same tile", async () => {
    // Head-on in the two-tile-wide corridor: the traffic rule makes one wait and the other go round.
    const { ids, shared } = await bothReach(
      { start: { row: 10, col: 6, heading: "E" }, goal: { row: 10, col: 16 }, seed: 21 },
      { start: { row: 10, col: 14, heading: "W" }, goal: { row: 10, col: 4 }, seed: 22 },
    );
    expect(shared).toEqual([]);
    // The rule was put to work, not dodged: at least one of them waited for the other.
    const rows = await server.db.select({ holds: missions.holds }).from(missions).where(inArray(missions.robotId, ids));
    expect(rows.reduce((n, r) => n + r.holds, 0)).toBeGreaterThan(0);
  });

  it("has two robots that meet face to face in an open room pass with one going round, while the other waits", async () => {
    // Both going round at once would side-step the same way and meet again, over and over. At
    // a slow enough pace the one that waits runs out of patience while the other is on its way
    // round, which is when it must keep waiting.
    const { ids, shared } = await bothReach(
      { start: { row: 3, col: 3, heading: "S" }, goal: { row: 6, col: 3 }, seed: 51, timeScale: 2 },
      { start: { row: 4, col: 3, heading: "N" }, goal: { row: 1, col: 3 }, seed: 52, timeScale: 2 },
    );
    expect(shared).toEqual([]);
    const said = await server.db.select({ robotId: alerts.robotId, message: alerts.message }).from(alerts).where(inArray(alerts.robotId, ids));
    const replanned = new Set(said.filter((a) => a.message.includes("re-planning around")).map((a) => a.robotId));
    expect(replanned.size).toBe(1);
  });

  it("has one robot back out of a one-tile doorway when two meet in it, and both reach their goals", async () => {
    // The left lab's only door is (9, 4): no way round exists, so re-planning alone would leave
    // both waiting for ever; the one that gives way steps aside off the other's route.
    const { ids, shared } = await bothReach(
      { start: { row: 8, col: 4, heading: "S" }, goal: { row: 11, col: 5 }, seed: 41 },
      { start: { row: 10, col: 4, heading: "N" }, goal: { row: 7, col: 3 }, seed: 42 },
    );
    expect(shared).toEqual([]);
    const said = await server.db.select({ message: alerts.message }).from(alerts).where(inArray(alerts.robotId, ids));
    expect(said.map((a) => a.message).filter((m) => m.includes("backing off")).length).toBeGreaterThan(0);
  });

  it("carries an admin's kidnap to the simulator and refuses faults for hardware", async () => {
    const sim = await simulated({ row: 2, col: 3, heading: "E" }, 31);
    try {
      await server.fleet.injectFault(sim.robot.id, { kind: "kidnap", row: 17, col: 20, heading: "N" }, actor);
      await expect.poll(() => sim.runtime().lastTruth, { timeout: 10_000 }).toEqual({ row: 17, col: 20, heading: "N" });
      await expect(server.fleet.injectFault(sim.robot.id, { kind: "kidnap", row: 0, col: 0 }, actor)).rejects.toThrow("Tile (0, 0) is blocked");
      const hardware = await server.addRobot({ simulated: false });
      await expect(server.fleet.injectFault(hardware.id, { kind: "drain" }, actor)).rejects.toThrow(/faults are injected into simulated robots only/);
    } finally {
      await sim.fleet.stop();
    }
  });
});
