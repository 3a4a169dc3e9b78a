/**
 * The /ops feed between the server and dashboards: frames the server pushes and the
 * commands a dashboard sends. Shared by server/ops-feed and the live floor client.
 */
import { z } from "zod";
import { ALERT_KINDS, HEADINGS, HOLD_REASONS, ROBOT_STATES } from "../vocabulary";
import { SimFaultSchema } from "./robot-link";

export const TileSchema = z.object({ row: z.number().int().min(0).max(511), col: z.number().int().min(0).max(511) });

export const EstimateSchema = z.object({
  row: z.number().int(),
  col: z.number().int(),
  heading: z.enum(HEADINGS),
  /** Belief mass on the most likely tile, over all headings, in [0, 1]. */
  tileMass: z.number(),
  /** Normalised entropy of the belief in [0, 1]; 1 = knows nothing. */
  entropy: z.number(),
});

export const RobotFrameSchema = z.object({
  robotId: z.string(),
  name: z.string(),
  floorplanId: z.number().int().nullable(),
  versionId: z.number().int().nullable(),
  simulated: z.boolean(),
  online: z.boolean(),
  state: z.enum(ROBOT_STATES),
  holdReason: z.enum(HOLD_REASONS).nullable(),
  battery: z.number().nullable(),
  estimate: EstimateSchema.nullable(),
  mission: z
    .object({
      id: z.number().int(),
      goal: TileSchema,
      step: z.number().int(),
      /** The tile this robot has claimed for its next forward step (traffic rule). */
      claim: TileSchema.nullable(),
      /** Tiles the policy would take from the most likely pose, goal last. */
      route: z.array(TileSchema),
      /** The robot it is stepping aside for, when it has backed off so that robot can pass. */
      givingWayTo: z.string().nullable(),
      /** It follows a way round another robot (or aside for one) instead of its own policy. */
      detouring: z.boolean(),
    })
    .nullable(),
  /** Recent certainty (tileMass) values, oldest first, for sparklines. */
  certaintyHistory: z.array(z.number()),
  lastMessageAt: z.number().nullable(),
});
export type RobotFrame = z.infer<typeof RobotFrameSchema>;

/** A belief frame: the tile marginal quantised to bytes (255 = the frame's largest tile mass). */
export interface BeliefFrame {
  robotId: string;
  rows: number;
  cols: number;
  /** Tile mass of the byte value 255, so mass ≈ byte / 255 * scale. */
  scale: number;
  data: Uint8Array;
}

export const AlertFrameSchema = z.object({
  id: z.number().int(),
  robotId: z.string().nullable(),
  kind: z.enum(ALERT_KINDS),
  message: z.string(),
  createdAt: z.number(),
  ackBy: z.string().nullable(),
  ackAt: z.number().nullable(),
});
export type AlertFrame = z.infer<typeof AlertFrameSchema>;

/** A floorplan version as dashboards draw it: row-major 0/1 or class layers. */
export const FloorplanViewSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  versionId: z.number().int(),
  version: z.number().int(),
  rows: z.number().int(),
  cols: z.number().int(),
  tileM: z.number(),
  blocked: z.array(z.number().int()),
  mark: z.array(z.number().int()),
  dock: z.array(z.number().int()),
  nogo: z.array(z.number().int()),
});
export type FloorplanView = z.infer<typeof FloorplanViewSchema>;

/** What the live floor page renders first, before socket frames arrive. */
export interface LiveFloorSnapshot {
  floorplan: FloorplanView;
  floorplans: { id: number; name: string }[];
  robots: RobotFrame[];
  alerts: AlertFrame[];
}

/** Commands a dashboard sends over /ops; each is answered through its acknowledgement. */
export const OpsCommandSchemas = {
  watch: z.object({ floorplanId: z.number().int() }),
  dispatch: z.object({ robotId: z.string().min(1).max(40), goal: TileSchema }),
  cancel: z.object({ robotId: z.string().min(1).max(40) }),
  hold: z.object({ robotId: z.string().min(1).max(40) }),
  release: z.object({ robotId: z.string().min(1).max(40) }),
  relocate: z.object({ robotId: z.string().min(1).max(40), row: z.number().int().min(0), col: z.number().int().min(0), heading: z.enum(HEADINGS).optional() }),
  ackAlert: z.object({ alertId: z.number().int() }),
  /** Admin only, simulated robots only: inject a fault into the simulator. */
  fault: z.object({ robotId: z.string().min(1).max(40), fault: SimFaultSchema }),
} as const;
export type OpsCommandName = keyof typeof OpsCommandSchemas;
export type OpsCommand<K extends OpsCommandName> = z.infer<(typeof OpsCommandSchemas)[K]>;

/** Acknowledgement of an /ops command: the same error shape as the HTTP routes. */
export type OpsAck<T = unknown> = { ok: true; data: T } | { ok: false; error: { code: string; message: string; fields?: Record<string, string[]> } };

/** Events the server emits on /ops. */
export const OPS_EVENTS = { robot: "robot", belief: "belief", alert: "alert", removed: "robot:removed", floorplan: "floorplan:version" } as const;

/** A new version of a floorplan was saved; pages showing an older one offer to show it. */
export const FloorplanVersionFrameSchema = z.object({ floorplanId: z.number().int(), versionId: z.number().int(), version: z.number().int() });
export type FloorplanVersionFrame = z.infer<typeof FloorplanVersionFrameSchema>;

/** Quantises a tile marginal into a belief frame's bytes. */
export function quantiseMarginal(marginal: ArrayLike<number>): { scale: number; data: Uint8Array } {
  let max = 0;
  for (let i = 0; i < marginal.length; i++) if (marginal[i] > max) max = marginal[i];
  const data = new Uint8Array(marginal.length);
  if (max <= 0) return { scale: 0, data };
  const k = 255 / max;
  for (let i = 0; i < marginal.length; i++) data[i] = Math.round(marginal[i] * k);
  return { scale: max, data };
}
