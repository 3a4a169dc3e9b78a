/**
 * The motion and sensor models a robot's filter used at a given point of its log. A
 * settings change is logged as a `models` event carrying the new models and the ones it
 * replaced, so replay re-runs every mission with the models it really ran with, even
 * after an admin has retuned the robot since.
 */
import { and, asc, desc, eq, gt, lte } from "drizzle-orm";
import type { Db } from "../../db/client";
import { events } from "../../db/schema";
import type { MotionModel } from "../../lib/motion";
import type { SensorModel } from "../../lib/sensing";

export interface Models {
  motion: MotionModel;
  sensor: SensorModel;
}

/** The payload of a `models` event. */
export interface ModelsEvent extends Models {
  before: Models;
}

export const MODELS_EVENT = "models";

/** The models in effect right after event `eventId` of `robotId`; `current` when none was ever logged. */
export async function modelsAt(db: Db, robotId: string, eventId: number, current: Models): Promise<Models> {
  const last = (
    await db
      .select({ payload: events.payload })
      .from(events)
      .where(and(eq(events.robotId, robotId), eq(events.kind, MODELS_EVENT), lte(events.id, eventId)))
      .orderBy(desc(events.id))
      .limit(1)
  )[0];
  if (last) {
    const p = last.payload as ModelsEvent;
    return { motion: p.motion, sensor: p.sensor };
  }
  const next = (
    await db
      .select({ payload: events.payload })
      .from(events)
      .where(and(eq(events.robotId, robotId), eq(events.kind, MODELS_EVENT), gt(events.id, eventId)))
      .orderBy(asc(events.id))
      .limit(1)
  )[0];
  return next ? (next.payload as ModelsEvent).before : current;
}

/** Whether two model sets are the same numbers, so tables built for one serve the other. */
export function sameModels(a: Models, b: Models): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}
