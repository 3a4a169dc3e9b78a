/**
 * The certainty curve and the what-if replay (issue 7): the curve agrees with step-by-step
 * replay, the same parameters give the same curve, and other parameters a different one.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { certaintyCurve } from "../../server/fleet/certainty-curve";
import { replayMission } from "../../server/fleet/replay";
import { scriptedRobot, startTestServer, type TestServer } from "../support/fleet-server";

let server: TestServer;
let missionId = 0;
let robotId = "";
const actor = { userId: null, label: "test" };

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { snapshotEvery: 4 });
});

/** Runs one scripted mission with an operator hold, once; tests share it (expect.poll needs a test). */
let ran: Promise<void> | null = null;
function missionRun(): Promise<void> {
  ran ??= (async () => {
    const scripted = await scriptedRobot(server);
    robotId = scripted.robot.id;
    await server.fleet.relocate(scripted.robot.id, { row: 10, col: 16, heading: "W" }, actor);
    missionId = (await server.fleet.dispatch(scripted.robot.id, { row: 10, col: 4 }, actor)).id;
    // Readings that change from step to step, including a floor mark and a missed echo.
    const readings = (i: number) => [
      { sensor: "us-front", rangeM: i % 3 === 0 ? 3 : 1.2 + i * 0.05 },
      { sensor: "us-left", rangeM: 0.46 },
      { sensor: "us-right", rangeM: 0.15 + (i % 2) * 0.02 },
      { sensor: "floor", mark: i === 5 ? 3 : 0 },
    ];
    for (let i = 0; i < 8; i++) await scripted.step(readings(i));
    await server.fleet.holdRobot(scripted.robot.id, actor);
    await server.fleet.cancel(scripted.robot.id, actor);
    await server.fleet.writer.flush();
    scripted.socket.close();
  })();
  return ran;
}

afterAll(async () => {
  await server.stop();
});

describe("certainty curve", () => {
  it("has one point per replay step, each equal to the replayed certainty at that step", async () => {
    await missionRun();
    const curve = await certaintyCurve(server.fleet, missionId);
    const final = await replayMission(server.fleet, missionId);
    expect(curve.points.map((p) => p.step)).toEqual(Array.from({ length: final.steps + 1 }, (_, i) => i));
    for (const k of [0, 3, 8, final.steps]) {
      const replayed = await replayMission(server.fleet, missionId, k);
      expect(curve.points[k].tileMass).toBeCloseTo(replayed.certainty.tileMass, 9);
      expect(curve.points[k].entropy).toBeCloseTo(replayed.certainty.entropy, 9);
    }
    expect(curve.marks).toEqual([expect.objectContaining({ kind: "hold", reason: "operator", step: final.steps })]);
    expect(curve.stepsBelowHold).toBe(curve.points.filter((p) => p.tileMass < curve.holdBelow).length);
  });

  it("gives the live curve for the robot's own parameters and another curve for other ones", async () => {
    await missionRun();
    const live = await certaintyCurve(server.fleet, missionId);
    const robot = server.fleet.robots.get(robotId)!;
    const ownSigma = robot.sensorModel.range.sigmaM;
    const same = await certaintyCurve(server.fleet, missionId, { motion: robot.motion, sensor: robot.sensorModel });
    expect(same.points.map((p) => p.tileMass)).toEqual(live.points.map((p) => p.tileMass));

    // A far noisier range model trusts each echo less, so certainty builds more slowly.
    const vague = await certaintyCurve(server.fleet, missionId, { sensor: { range: { sigmaM: 0.4 } } });
    const differences = vague.points.map((p, i) => Math.abs(p.tileMass - live.points[i].tileMass));
    expect(Math.max(...differences)).toBeGreaterThan(0.01);
    expect(vague.points[0].tileMass).toBe(live.points[0].tileMass);

    const slippery = await certaintyCurve(server.fleet, missionId, { motion: { forward: { ok: 0.5, stall: 0.25, over: 0.25 } } });
    expect(slippery.points.some((p, i) => Math.abs(p.tileMass - live.points[i].tileMass) > 0.01)).toBe(true);
    // A what-if leaves the robot's own models as they were.
    expect(robot.sensorModel.range.sigmaM).toBe(ownSigma);
    expect((await certaintyCurve(server.fleet, missionId)).points).toEqual(live.points);
  });

  it("still draws a retired robot's missions, with the models of its roster row", async () => {
    await missionRun();
    const before = await certaintyCurve(server.fleet, missionId);
    await server.fleet.retire(robotId, actor);
    expect(server.fleet.robots.has(robotId)).toBe(false);
    const after = await certaintyCurve(server.fleet, missionId);
    expect(after.points.map((p) => p.tileMass)).toEqual(before.points.map((p) => p.tileMass));
    expect(after.marks).toEqual(before.marks);
  });

  it("refuses a mission that does not exist", async () => {
    await expect(certaintyCurve(server.fleet, 987654321)).rejects.toThrow("no mission 987654321");
  });
});
