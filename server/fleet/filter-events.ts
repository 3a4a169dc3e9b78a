/** Stored events that change a belief (moved, sensed, relocate), applied the same way live, on rebuild and in replay. */
import { poseBelief } from "../../lib/belief";
import type { Floorplan } from "../../lib/floorplan";
import { actionCarriedOut, type Odometry } from "../../lib/motion";
import type { SensorReading } from "../../lib/sensing";
import type { Action, Heading } from "../../lib/vocabulary";

/** The event kinds that change a belief. */
export const FILTER_EVENT_KINDS = ["moved", "sensed", "relocate"] as const;

/** What a stored filter event acts on: a robot runtime, or a bare filter with its plan (replay). */
export interface FilterTarget {
  plan: Floorplan;
  move(action: Action): void;
  sense(readings: readonly SensorReading[]): unknown;
  reset(belief?: ArrayLike<number>): void;
}

/** Applies one filter event to a belief: live as it arrives, and stored, on rebuild and in replay. */
export function applyToFilter(target: FilterTarget, kind: string, payload: Record<string, unknown>): void {
  if (kind === "moved") target.move(actionCarriedOut(payload.action as Action, payload.odometry as Odometry | undefined, target.plan.tileM));
  else if (kind === "sensed") target.sense(payload.readings as SensorReading[]);
  else if (kind === "relocate") {
    const heading = typeof payload.heading === "string" ? (payload.heading as Heading) : undefined;
    target.reset(poseBelief(target.plan, { row: Number(payload.row), col: Number(payload.col), heading }, 0));
  }
}
