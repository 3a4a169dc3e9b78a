/** Replay equals live (issue 7): the re-run filter gives the live filter's belief at every snapshot and at the end. */
import { asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { beliefs } from "../../db/schema";
import { defaultRobotSettings } from "../../lib/roster";
import { certaintyCurve } from "../../server/fleet/certainty-curve";
import { replayMission } from "../../server/fleet/replay";
import { scriptedRobot, startTestServer, type TestServer } from "../support/fleet-server";

let server: TestServer;
const actor = { userId: null, label: "test" };

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { snapshotEvery: 4 });
});

afterAll(async () => {
  await server.stop();
});

function worstDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

describe("replay", () => {
  it("re-runs a mission to the same belief the live filter stored, step by step", async () => {
    const scripted = await scriptedRobot(server);
    await server.fleet.relocate(scripted.robot.id, { row: 10, col: 16, heading: "W" }, actor);
    const mission = await server.fleet.dispatch(scripted.robot.id, { row: 10, col: 4 }, actor);
    // Readings that change from step to step, including a floor mark and a missed echo.
    const readings = (i: number) => [
      { sensor: "us-front", rangeM: i % 3 === 0 ? 3 : 1.2 + i * 0.05 },
      { sensor: "us-left", rangeM: 0.46 },
      { sensor: "us-right", rangeM: 0.15 + (i % 2) * 0.02 },
      { sensor: "floor", mark: i === 5 ? 3 : 0 },
    ];
    for (let i = 0; i < 10; i++) await scripted.step(readings(i));
    const live = Float64Array.from(server.fleet.robots.get(scripted.robot.id)!.filter.belief);

    const final = await replayMission(server.fleet, mission.id);
    expect(final.steps).toBe(20);
    expect(final.event).toMatchObject({ kind: "sensed" });
    expect(worstDifference(final.belief, live)).toBeLessThan(1e-6);

    await server.fleet.writer.flush();
    const stored = await server.db.select().from(beliefs).where(eq(beliefs.missionId, mission.id)).orderBy(asc(beliefs.id));
    // The start, and one every 4 fused steps of the 10.
    expect(stored.length).toBe(3);
    const start = await replayMission(server.fleet, mission.id, 0);
    for (const snapshot of stored) {
      const step = snapshot.eventId === start.eventId ? 0 : (await stepOfEvent(mission.id, snapshot.eventId));
      const replayed = await replayMission(server.fleet, mission.id, step);
      const storedBelief = new Float64Array(snapshot.belief.buffer.slice(snapshot.belief.byteOffset, snapshot.belief.byteOffset + snapshot.belief.byteLength));
      expect(worstDifference(replayed.belief, storedBelief)).toBeLessThan(1e-6);
    }
    expect(start.certainty).toMatchObject({ row: 10, col: 16, tileMass: 1 });
    await expect(replayMission(server.fleet, mission.id, 21)).rejects.toThrow("outside mission");
    await server.fleet.cancel(scripted.robot.id, actor);
    scripted.socket.close();
  });
});

describe("replay across a retuning", () => {
  it("re-runs a mission with the models it ran with, before and after a mid-mission settings change and after a later one", async () => {
    const scripted = await scriptedRobot(server);
    const robotId = scripted.robot.id;
    await server.fleet.relocate(robotId, { row: 10, col: 16, heading: "W" }, actor);
    const mission = await server.fleet.dispatch(robotId, { row: 10, col: 4 }, actor);
    const readings = (i: number) => [
      { sensor: "us-front", rangeM: i % 3 === 0 ? 3 : 1.2 + i * 0.05 },
      { sensor: "us-left", rangeM: 0.46 },
      { sensor: "us-right", rangeM: 0.15 + (i % 2) * 0.02 },
      { sensor: "floor", mark: 0 },
    ];
    for (let i = 0; i < 3; i++) await scripted.step(readings(i));
    const base = defaultRobotSettings("differential");
    const retuned = { ...base, sensing: { ...base.sensing, range: { ...base.sensing.range, sigmaM: 0.15 } } };
    await server.fleet.applySettings(robotId, retuned);
    for (let i = 3; i < 6; i++) await scripted.step(readings(i));
    const live = Float64Array.from(server.fleet.robots.get(robotId)!.filter.belief);
    await server.fleet.cancel(robotId, actor);
    // A later retuning must not change how this mission replays.
    await server.fleet.applySettings(robotId, { ...base, sensing: { ...base.sensing, range: { ...base.sensing.range, sigmaM: 0.5 } } });
    await server.fleet.writer.flush();

    const final = await replayMission(server.fleet, mission.id);
    expect(worstDifference(final.belief, live)).toBeLessThan(1e-6);
    const curve = await certaintyCurve(server.fleet, mission.id);
    expect(curve.points.at(-1)!.tileMass).toBeCloseTo(final.certainty.tileMass, 9);
    scripted.socket.close();
  });
});

/** The replay step whose belief follows event `eventId`: its position among the mission's steps. */
async function stepOfEvent(missionId: number, eventId: number): Promise<number> {
  for (let k = 1; ; k++) {
    const r = await replayMission(server.fleet, missionId, k);
    if (r.eventId === eventId) return k;
    if (r.eventId > eventId || k >= r.steps) throw new Error(`event ${eventId} is not a step of mission ${missionId}`);
  }
}
