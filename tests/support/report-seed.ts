/** Rows for report and logbook suites: a floorplan of their own, robots on it, missions and hold events in bulk. */
import { encodeLayers } from "../../db/queries/floorplans";
import type { Db } from "../../db/client";
import { events, floorplans, floorplanVersions, missions, robots } from "../../db/schema";
import type { HoldReason, MissionState } from "../../lib/vocabulary";
import { planFromLines } from "./plans";
import { TEST_SENSORS } from "./fleet-server";

const CHUNK = 500;

/** A new floorplan (unique name) with one small version. */
export async function seedFloorplan(db: Db, name: string): Promise<{ floorplanId: number; versionId: number }> {
  const plan = planFromLines(["....", "....", "...."]);
  const [{ id: floorplanId }] = await db.insert(floorplans).values({ name }).$returningId();
  const [{ id: versionId }] = await db
    .insert(floorplanVersions)
    .values({ floorplanId, version: 1, rows: plan.rows, cols: plan.cols, tileM: plan.tileM, layers: encodeLayers(plan) })
    .$returningId();
  return { floorplanId, versionId };
}

/**
 * Robots on a floorplan, registered with a key no one holds; ids are unique per run. They
 * are retired at once, so a fleet another suite starts later does not load them.
 */
export async function seedRobots(db: Db, floorplanId: number, names: string[]): Promise<string[]> {
  const stamp = `${process.pid}-${Date.now() % 1_000_000}`;
  const rows = names.map((name, i) => ({ id: `rp-${stamp}-${floorplanId}-${i}`, name, keyHash: "x", sensors: TEST_SENSORS, floorplanId, retiredAt: new Date() }));
  await db.insert(robots).values(rows);
  return rows.map((r) => r.id);
}

export interface SeedMission {
  robotId: string;
  versionId: number;
  state: MissionState;
  startedAt: number;
  endedAt: number | null;
  minCertainty: number | null;
  goalRow?: number;
  goalCol?: number;
  holds?: HoldReason[];
}

/** Inserts missions in chunks of multi-row inserts, then their hold events; answers the ids in order. */
export async function seedMissions(db: Db, list: SeedMission[]): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < list.length; i += CHUNK) {
    const chunk = list.slice(i, i + CHUNK);
    const inserted = await db
      .insert(missions)
      .values(
        chunk.map((m) => ({
          robotId: m.robotId,
          versionId: m.versionId,
          goalRow: m.goalRow ?? 1,
          goalCol: m.goalCol ?? 2,
          state: m.state,
          holds: m.holds?.length ?? 0,
          minCertainty: m.minCertainty,
          startedAt: new Date(m.startedAt),
          endedAt: m.endedAt === null ? null : new Date(m.endedAt),
        })),
      )
      .$returningId();
    ids.push(...inserted.map((r) => r.id));
  }
  const holdRows = list.flatMap((m, i) =>
    (m.holds ?? []).map((reason, k) => ({
      robotId: m.robotId,
      seq: null,
      missionId: ids[i],
      source: "server" as const,
      kind: "hold",
      payload: { reason, mission: ids[i] },
      robotAt: null,
      receivedAt: new Date(m.startedAt + 1000 * (k + 1)),
    })),
  );
  for (let i = 0; i < holdRows.length; i += CHUNK) await db.insert(events).values(holdRows.slice(i, i + CHUNK));
  return ids;
}
