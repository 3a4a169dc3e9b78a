import { eq } from "drizzle-orm";
import { floorplanVersions, missions, robots } from "../db/schema";
import { appDb } from "./db";
import { TesseraError } from "./errors";
import { runningFleet } from "./registry";

/** A mission row with, while it runs, its live step and route. */
export async function missionDetail(id: number) {
  const found = (
    await appDb()
      .select({ row: missions, floorplanId: floorplanVersions.floorplanId, robotName: robots.name })
      .from(missions)
      .innerJoin(floorplanVersions, eq(floorplanVersions.id, missions.versionId))
      .innerJoin(robots, eq(robots.id, missions.robotId))
      .where(eq(missions.id, id))
      .limit(1)
  )[0];
  const row = found?.row;
  if (!row) throw new TesseraError("not_found", "mission", `There is no mission ${id}.`);
  const runtime = runningFleet().robots.get(row.robotId);
  const live = runtime?.mission?.id === id ? runningFleet().frame(runtime).mission : null;
  return {
    mission: {
      id: row.id,
      robotId: row.robotId,
      robotName: found.robotName,
      versionId: row.versionId,
      floorplanId: found.floorplanId,
      goal: { row: row.goalRow, col: row.goalCol },
      state: row.state,
      steps: live?.step ?? row.steps,
      holds: row.holds,
      minCertainty: row.minCertainty,
      startedAt: row.startedAt.getTime(),
      endedAt: row.endedAt ? row.endedAt.getTime() : null,
      route: live?.route ?? null,
    },
  };
}
