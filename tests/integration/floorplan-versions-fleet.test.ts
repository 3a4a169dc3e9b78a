/**
 * New floorplan versions and the fleet (issue 6): a robot idle on a floorplan moves to the
 * version just saved, keeping its belief when the grid keeps its shape; a robot under way
 * keeps the version its mission pinned until that mission ends.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { createFloorplan } from "../../db/queries/floorplans";
import { missions, robots } from "../../db/schema";
import type { Floorplan } from "../../lib/floorplan";
import { saveVersion } from "../../server/floorplans/store";
import { connectRobot, helloPayload, startTestServer, type TestServer } from "../support/fleet-server";
import { planFromLines } from "../support/plans";

const actor = { userId: null, label: "floorplan test" };
let server: TestServer;

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { heartbeatTimeoutMs: 10_000 });
});

afterAll(async () => {
  await server.stop();
});

const FIRST = ["########", "#......#", "#..#...#", "#......#", "#...#..#", "########"];

/** A floorplan of its own (unique name) with one connected robot on it. */
async function robotOnNewFloorplan(tag: string) {
  const name = `Versions ${tag} ${process.pid}-${Date.now()}`;
  const { floorplanId, versionId } = await createFloorplan(server.db, { name, plan: planFromLines(FIRST) });
  const robot = await server.addRobot({ name: `Probe ${tag}` });
  await server.db.update(robots).set({ floorplanId }).where(eq(robots.id, robot.id));
  await server.fleet.register((await server.db.select().from(robots).where(eq(robots.id, robot.id)))[0]);
  const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
  expect(await socket.call("hello", helloPayload(1))).toMatchObject({ ok: true });
  return { floorplanId, versionId, robotId: robot.id, socket, runtime: () => server.fleet.robots.get(robot.id)! };
}

function massOnTile(belief: ArrayLike<number>, plan: Floorplan, row: number, col: number): number {
  const base = (row * plan.cols + col) * 4;
  return belief[base] + belief[base + 1] + belief[base + 2] + belief[base + 3];
}

describe("floorplan versions in the fleet", () => {
  it("moves an idle robot to a new version, keeping its belief when the shape is unchanged and resetting it when it is not", async () => {
    const { floorplanId, versionId, robotId, socket, runtime } = await robotOnNewFloorplan("idle");
    try {
      await server.fleet.relocate(robotId, { row: 3, col: 5, heading: "E" }, actor);
      expect(runtime().versionId).toBe(versionId);
      const before = runtime().certainty();

      // Version 2 walls off tile (1, 6), where a little of the belief's spread lay.
      const walled = planFromLines(["########", "#.....##", "#..#...#", "#......#", "#...#..#", "########"]);
      const v2 = await saveVersion(server.db, { floorplanId, plan: walled, note: "shelf at (1, 6)", userId: null });
      expect(v2.version).toBe(2);
      expect(await server.fleet.floorplanChanged(floorplanId)).toEqual([robotId]);
      expect(runtime().versionId).toBe(v2.versionId);
      expect(runtime().plan.blocked[1 * 8 + 6]).toBe(1);
      const after = runtime().certainty();
      expect([after.row, after.col, after.heading]).toEqual([before.row, before.col, before.heading]);
      expect(after.tileMass).toBeGreaterThanOrEqual(before.tileMass);
      expect(massOnTile(runtime().filter.belief, runtime().plan, 1, 6)).toBe(0);

      // Version 3 adds a row: the old belief does not fit, so it is uniform over the 27 free tiles.
      const taller = planFromLines(["########", "#.....##", "#..#...#", "#......#", "#...#..#", "#......#", "########"]);
      const v3 = await saveVersion(server.db, { floorplanId, plan: taller, note: "annex row", userId: null });
      expect(v3.version).toBe(3);
      await server.fleet.floorplanChanged(floorplanId);
      expect(runtime().versionId).toBe(v3.versionId);
      expect(runtime().plan.rows).toBe(7);
      expect(massOnTile(runtime().filter.belief, runtime().plan, 5, 3)).toBeCloseTo(1 / 27, 9);
      expect(massOnTile(runtime().filter.belief, runtime().plan, 2, 3)).toBe(0);

      // Nothing new to pick up: nobody moves.
      expect(await server.fleet.floorplanChanged(floorplanId)).toEqual([]);
      // A restarted server loads the robot onto the version it moved to.
      const row = (await server.db.select().from(robots).where(eq(robots.id, robotId)))[0];
      expect((await server.fleet.load(row)).versionId).toBe(v3.versionId);
    } finally {
      socket.disconnect();
    }
  });

  it("keeps a robot under way on its mission's version and moves it when the mission ends", async () => {
    const { floorplanId, versionId, robotId, socket, runtime } = await robotOnNewFloorplan("busy");
    try {
      await server.fleet.relocate(robotId, { row: 1, col: 1, heading: "E" }, actor);
      const mission = await server.fleet.dispatch(robotId, { row: 4, col: 6 }, actor);
      expect(mission.versionId).toBe(versionId);

      const v2 = await saveVersion(server.db, { floorplanId, plan: planFromLines(["########", "#......#", "#..##..#", "#......#", "#...#..#", "########"]), note: "second pillar", userId: null });
      expect(await server.fleet.floorplanChanged(floorplanId)).toEqual([]);
      expect(runtime().versionId).toBe(versionId);
      expect(runtime().mission?.versionId).toBe(versionId);
      expect(runtime().plan.blocked[2 * 8 + 4]).toBe(0);

      await server.fleet.cancel(robotId, actor);
      const stored = (await server.db.select().from(missions).where(eq(missions.id, mission.id)))[0];
      expect(stored).toMatchObject({ state: "aborted", versionId });
      expect(runtime().versionId).toBe(v2.versionId);
      expect(runtime().plan.blocked[2 * 8 + 4]).toBe(1);
    } finally {
      socket.disconnect();
    }
  });
});
