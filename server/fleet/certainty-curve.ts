/**
 * A mission's certainty over time, replayed from its starting belief through every
 * logged filter message — with the robot's own models, or with what-if parameters, so
 * a lead can see whether a retuned model would have kept the robot out of a hold.
 * One pass over the mission, not a seek per step: a curve costs one update per step.
 */
import { and, asc, eq, gt, inArray, lte } from "drizzle-orm";
import { createFilter, certainty } from "../../lib/belief";
import type { MotionModel } from "../../lib/motion";
import type { CertaintyCurve, WhatIf } from "../../lib/protocol/what-if";
import type { SensorModel } from "../../lib/sensing";
import { beliefs, events, missions } from "../../db/schema";
import { TesseraError } from "../errors";
import type { Fleet } from "./fleet";
import { applyToFilter, FILTER_EVENT_KINDS, type FilterTarget } from "./filter-events";
import { missionRobot } from "./mission-robot";
import { MODELS_EVENT, modelsAt, sameModels, type Models } from "./models-at";

/** The robot's models with a what-if's fields laid over them. */
export function withOverrides(motion: MotionModel, sensor: SensorModel, whatIf: WhatIf): { motion: MotionModel; sensor: SensorModel } {
  const m = whatIf.motion ?? {};
  const s = whatIf.sensor ?? {};
  return {
    motion: { ...motion, forward: { ...motion.forward, ...m.forward }, turn: { ...motion.turn, ...m.turn }, mix: m.mix ?? motion.mix },
    sensor: {
      range: {
        sigmaM: s.range?.sigmaM ?? sensor.range.sigmaM,
        lambdaShort: s.range?.lambdaShort ?? sensor.range.lambdaShort,
        weights: { ...sensor.range.weights, ...s.range?.weights },
      },
      floor: { ...sensor.floor, ...s.floor },
    },
  };
}

function float64(buffer: Buffer): Float64Array {
  return new Float64Array(buffer.buffer.slice(buffer.byteOffset, buffer.byteOffset + buffer.byteLength));
}

/** The robot's current motion and sensor models, as its filter uses them (its roster row's once retired). */
export async function robotModels(fleet: Fleet, robotId: string): Promise<Models> {
  return (await missionRobot(fleet, robotId, "certainty")).current;
}

/** The certainty after each step of mission `missionId`, with the robot's models or a what-if. */
export async function certaintyCurve(fleet: Fleet, missionId: number, whatIf?: WhatIf): Promise<CertaintyCurve> {
  const db = fleet.db;
  const mission = (await db.select().from(missions).where(eq(missions.id, missionId)).limit(1))[0];
  if (!mission) throw new TesseraError("not_found", "certainty", `There is no mission ${missionId}.`);
  const start = (await db.select().from(beliefs).where(eq(beliefs.missionId, missionId)).orderBy(asc(beliefs.id)).limit(1))[0];
  if (!start) throw new TesseraError("unprocessable", "certainty", `Mission ${missionId} has no starting belief to replay from.`);
  const { current: own, sensors, runtime } = await missionRobot(fleet, mission.robotId, "certainty");

  // The live curve follows the models the robot ran with, retunings included; a what-if
  // lays its parameters over the models at the start and keeps them throughout.
  const atStart = await modelsAt(db, mission.robotId, start.eventId, own);
  const plan = await fleet.planOf(mission.versionId);
  const build = (models: Models) => {
    // The transition table depends on the motion model, the range table only on the plan and sensors.
    const live = runtime && runtime.versionId === mission.versionId;
    const shared = live ? { ranges: runtime.filter.ranges, ...(sameModels(models, own) ? { table: runtime.filter.table } : {}) } : {};
    return createFilter(plan, models.motion, sensors, models.sensor, shared);
  };
  let filter = build(whatIf ? withOverrides(atStart.motion, atStart.sensor, whatIf) : atStart);
  filter.reset(float64(start.belief));

  const steps = await db
    .select({ id: events.id, kind: events.kind, payload: events.payload, receivedAt: events.receivedAt })
    .from(events)
    .where(and(eq(events.missionId, missionId), inArray(events.kind, [...FILTER_EVENT_KINDS]), gt(events.id, start.eventId)))
    .orderBy(asc(events.id));
  const lastId = steps.at(-1)?.id ?? start.eventId;
  // Replay applies every filter message of the robot in that window, as the live filter did.
  const applied = await db
    .select({ id: events.id, kind: events.kind, payload: events.payload })
    .from(events)
    .where(and(eq(events.robotId, mission.robotId), inArray(events.kind, [...FILTER_EVENT_KINDS, MODELS_EVENT]), gt(events.id, start.eventId), lte(events.id, lastId)))
    .orderBy(asc(events.id));
  const stepIds = new Map(steps.map((s, i) => [s.id, { step: i + 1, at: s.receivedAt.getTime() }]));

  const target: FilterTarget = { plan, move: (action) => filter.motion(action), sense: (readings) => filter.sense(readings), reset: (b) => filter.reset(b) };
  const c0 = certainty(plan, filter.belief);
  const points = [{ step: 0, at: mission.startedAt.getTime(), tileMass: c0.tileMass, entropy: c0.entropy }];
  for (const e of applied) {
    if (e.kind === MODELS_EVENT) {
      if (!whatIf) {
        const belief = Float64Array.from(filter.belief);
        filter = build(e.payload as Models);
        filter.reset(belief);
      }
      continue;
    }
    applyToFilter(target, e.kind, e.payload as Record<string, unknown>);
    const at = stepIds.get(e.id);
    if (!at) continue;
    const c = certainty(plan, filter.belief);
    points.push({ step: at.step, at: at.at, tileMass: c.tileMass, entropy: c.entropy });
  }

  const holdRows = await db
    .select({ id: events.id, kind: events.kind, payload: events.payload, receivedAt: events.receivedAt })
    .from(events)
    // The commands the robot received; an operator's request is logged beside it as well.
    .where(and(eq(events.missionId, missionId), eq(events.source, "server"), inArray(events.kind, ["hold", "release"])))
    .orderBy(asc(events.id));
  const marks = holdRows.map((h) => {
    const payload = h.payload as { reason?: unknown; by?: unknown };
    const before = steps.filter((s) => s.id < h.id).length;
    const reason = typeof payload.reason === "string" ? payload.reason : typeof payload.by === "string" ? "operator" : null;
    return { step: before, at: h.receivedAt.getTime(), kind: h.kind as "hold" | "release", reason };
  });
  const holdBelow = fleet.config.holdBelow;
  return { missionId, points, marks, holdBelow, stepsBelowHold: points.filter((p) => p.tileMass < holdBelow).length };
}
