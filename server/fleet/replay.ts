/**
 * Replay: a mission's belief at any step, re-run through the same filter code from the
 * snapshot before that step and the logged events after it — exactly what the live
 * filter had, not a recording of it. Step 0 is the belief the mission started from; step
 * k is the belief after the mission's k-th belief-changing event (moved, sensed, relocate).
 */
import { and, asc, desc, eq, gt, gte, inArray, lte } from "drizzle-orm";
import { createFilter, certainty, type Certainty, type Filter } from "../../lib/belief";
import { beliefs, events, missions, type MissionRow } from "../../db/schema";
import { HEADINGS } from "../../lib/vocabulary";
import { TesseraError } from "../errors";
import type { Fleet } from "./fleet";
import { applyToFilter, FILTER_EVENT_KINDS, type FilterTarget } from "./filter-events";
import { missionRobot } from "./mission-robot";
import { MODELS_EVENT, modelsAt, sameModels, type Models } from "./models-at";

export interface ReplayResult {
  mission: MissionRow;
  step: number;
  /** Steps the mission has (its belief-changing events). */
  steps: number;
  /** The event the belief follows (0 before any). */
  eventId: number;
  /** What that event was: the action taken, the readings fused, or the pose hint. */
  event: { kind: string; payload: unknown } | null;
  belief: Float64Array;
  certainty: Certainty;
  /** Simulated robots: the true pose last reported by then. */
  truth: { row: number; col: number; heading: string } | null;
}

function float64(buffer: Buffer): Float64Array {
  return new Float64Array(buffer.buffer.slice(buffer.byteOffset, buffer.byteOffset + buffer.byteLength));
}

/** The belief of mission `missionId` at `step` (the last step when omitted). */
export async function replayMission(fleet: Fleet, missionId: number, step?: number): Promise<ReplayResult> {
  const db = fleet.db;
  const mission = (await db.select().from(missions).where(eq(missions.id, missionId)).limit(1))[0];
  if (!mission) throw new TesseraError("not_found", "replay", `There is no mission ${missionId}.`);
  const start = (await db.select().from(beliefs).where(eq(beliefs.missionId, missionId)).orderBy(asc(beliefs.id)).limit(1))[0];
  if (!start) throw new TesseraError("unprocessable", "replay", `Mission ${missionId} has no starting belief to replay from.`);
  const steps = await db
    .select({ id: events.id, kind: events.kind, payload: events.payload })
    .from(events)
    .where(and(eq(events.missionId, missionId), inArray(events.kind, [...FILTER_EVENT_KINDS]), gt(events.id, start.eventId)))
    .orderBy(asc(events.id));
  const k = step ?? steps.length;
  if (!Number.isInteger(k) || k < 0 || k > steps.length) {
    throw new TesseraError("bad_request", "replay", `Step ${step} is outside mission ${missionId}'s steps 0 to ${steps.length}.`);
  }
  const target = k === 0 ? start.eventId : steps[k - 1].id;

  const { current, sensors, runtime } = await missionRobot(fleet, mission.robotId, "replay");
  const plan = await fleet.planOf(mission.versionId);

  // The nearest snapshot at or before the target bounds the work per seek.
  const snapshot = (
    await db
      .select()
      .from(beliefs)
      .where(and(eq(beliefs.robotId, mission.robotId), eq(beliefs.versionId, mission.versionId), lte(beliefs.eventId, target), gte(beliefs.id, start.id)))
      .orderBy(desc(beliefs.eventId), desc(beliefs.id))
      .limit(1)
  )[0];
  const build = (models: Models): Filter => {
    const live = runtime && runtime.versionId === mission.versionId;
    const shared = live ? { ranges: runtime.filter.ranges, ...(sameModels(models, current) ? { table: runtime.filter.table } : {}) } : {};
    return createFilter(plan, models.motion, sensors, models.sensor, shared);
  };
  let filter = build(await modelsAt(db, mission.robotId, snapshot.eventId, current));
  filter.reset(float64(snapshot.belief));
  const later = await db
    .select({ kind: events.kind, payload: events.payload })
    .from(events)
    .where(and(eq(events.robotId, mission.robotId), inArray(events.kind, [...FILTER_EVENT_KINDS, MODELS_EVENT]), gt(events.id, snapshot.eventId), lte(events.id, target)))
    .orderBy(asc(events.id));
  const replayTarget: FilterTarget = {
    plan,
    move: (action) => filter.motion(action),
    sense: (readings) => filter.sense(readings),
    reset: (b) => filter.reset(b),
  };
  for (const e of later) {
    if (e.kind === MODELS_EVENT) {
      const belief = Float64Array.from(filter.belief);
      filter = build(e.payload as Models);
      filter.reset(belief);
    } else applyToFilter(replayTarget, e.kind, e.payload as Record<string, unknown>);
  }

  const truthRow = (
    await db
      .select({ payload: events.payload })
      .from(events)
      .where(and(eq(events.robotId, mission.robotId), eq(events.kind, "truth"), lte(events.id, target), gt(events.id, start.eventId)))
      .orderBy(desc(events.id))
      .limit(1)
  )[0];
  const belief = Float64Array.from(filter.belief);
  return {
    mission,
    step: k,
    steps: steps.length,
    eventId: target,
    event: k === 0 ? null : { kind: steps[k - 1].kind, payload: steps[k - 1].payload },
    belief,
    certainty: certainty(plan, belief),
    truth: (truthRow?.payload as ReplayResult["truth"]) ?? null,
  };
}

/** A replay as the API answers it: the tile marginal quantised like a belief frame, and the error to the truth. */
export function replayView(result: ReplayResult, marginal: { scale: number; data: Uint8Array }) {
  const c = result.certainty;
  const truth = result.truth;
  return {
    missionId: result.mission.id,
    step: result.step,
    steps: result.steps,
    eventId: result.eventId,
    event: result.event,
    estimate: { row: c.row, col: c.col, heading: HEADINGS[c.heading], tileMass: c.tileMass, entropy: c.entropy },
    truth,
    errorTiles: truth ? Math.abs(truth.row - c.row) + Math.abs(truth.col - c.col) : null,
    belief: { scale: marginal.scale, data: Buffer.from(marginal.data).toString("base64") },
  };
}
