import { eq } from "drizzle-orm";
import { missions } from "../db/schema";
import { appDb } from "./db";
import { TesseraError } from "./errors";
import { runningFleet } from "./registry";

/** A mission row with, while it runs, its live step and route. */
export async function missionDetail(id: number) {
  const row = (await appDb().select().from(missions).where(eq(missions.id, id)).limit(1))[0];
  if (!row) throw new TesseraError("not_found", "mission", `There is no mission ${id}.`);
  const runtime = runningFleet().robots.get(row.robotId);
  const live = runtime?.mission?.id === id ? runningFleet().frame(runtime).mission : null;
  return {
    mission: {
      id: row.id,
      robotId: row.robotId,
      versionId: row.versionId,
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
