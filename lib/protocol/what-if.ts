/**
 * The logbook's certainty curve and its what-if variant: the same logged messages
 * replayed with other motion or sensor parameters. Shared by the route, the page and
 * the tests.
 */
import { z } from "zod";
import { SettingField } from "../roster/settings";

const weight = SettingField.weight;

/** Motion parameters a what-if may change; omitted fields keep the robot's own. */
export const MotionOverrideSchema = z
  .object({
    forward: z.object({ ok: weight, stall: weight, over: weight }).partial().optional(),
    turn: z.object({ ok: weight, none: weight, reverse: weight }).partial().optional(),
    mix: SettingField.mix.optional(),
  })
  .strict();

/** Sensor parameters a what-if may change; omitted fields keep the robot's own. */
export const SensorOverrideSchema = z
  .object({
    range: z
      .object({
        sigmaM: SettingField.sigmaM,
        lambdaShort: SettingField.lambdaShort,
        weights: z.object({ hit: weight, short: weight, max: weight, rand: weight }).partial(),
      })
      .partial()
      .optional(),
    floor: z.object({ hit: SettingField.floorHit }).partial().optional(),
  })
  .strict();

export const WhatIfSchema = z.object({ motion: MotionOverrideSchema.optional(), sensor: SensorOverrideSchema.optional() }).strict();
export type WhatIf = z.infer<typeof WhatIfSchema>;

export const CurvePointSchema = z.object({
  step: z.number().int().min(0),
  /** When the message that made this step was received, epoch ms. */
  at: z.number(),
  tileMass: z.number(),
  entropy: z.number(),
});
export type CurvePoint = z.infer<typeof CurvePointSchema>;

/** A hold or release on the mission, placed at the step it followed. */
export const CurveMarkSchema = z.object({
  step: z.number().int().min(0),
  at: z.number(),
  kind: z.enum(["hold", "release"]),
  reason: z.string().nullable(),
});
export type CurveMark = z.infer<typeof CurveMarkSchema>;

export const CertaintyCurveSchema = z.object({
  missionId: z.number().int(),
  points: z.array(CurvePointSchema),
  marks: z.array(CurveMarkSchema),
  /** The fleet's automatic-hold threshold on tile mass, for reading the curve against. */
  holdBelow: z.number(),
  /** Steps whose tile mass falls below holdBelow. */
  stepsBelowHold: z.number().int(),
});
export type CertaintyCurve = z.infer<typeof CertaintyCurveSchema>;

export const WhatIfResultSchema = z.object({ baseline: CertaintyCurveSchema, whatIf: CertaintyCurveSchema });
export type WhatIfResult = z.infer<typeof WhatIfResultSchema>;
