/**
 * A robot's tuning as the roster stores it (robots.settings): the motion-model and
 * sensor-model parameters its live filter and its policies use, and the heading-controller
 * gains pushed to the robot with `tune` (PROTOCOL.md).
 *
 * Assumes the robot's drive type is kept on the robot itself, so the stored motion
 * parameters carry no drive and the defaults follow the drive (lib/motion defaultMotion).
 * A stored value that no longer passes the schema (an older shape, a hand edit) falls back
 * to the defaults section by section, so a bad section never blocks a robot from loading.
 * Ranges follow the models' own contracts: outcome weights non-negative with a positive sum
 * (lib/motion model.ts), beam mixture weights summing to 1 (Probabilistic Robotics §6.3).
 */
import { z } from "zod";
import { defaultHeadingGains } from "../control/gains";
import { defaultMotion, type MotionModel } from "../motion/model";
import { defaultSensorModel, type SensorModel } from "../sensing/model";
import type { Drive } from "../vocabulary";

/** How far the beam weights may stray from a sum of 1 (rounding in a form). */
export const WEIGHT_SUM_TOLERANCE = 1e-6;

/** The bounds of each tuning field, declared once for the stored settings and the logbook's what-if overrides. */
export const SettingField = {
  weight: z.number().min(0, "must be 0 or more").max(1, "must be at most 1"),
  mix: z.number().min(0, "must be 0 or more").lt(0.5, "must be under 0.5"),
  sigmaM: z.number().positive("must be above 0").max(2, "must be at most 2 m"),
  lambdaShort: z.number().positive("must be above 0").max(100, "must be at most 100 per metre"),
  floorHit: z.number().gt(0, "must be above 0").max(1, "must be at most 1"),
};

const weight = SettingField.weight;

function outcomeWeights<S extends Record<string, typeof weight>>(shape: S) {
  return z.object(shape).refine((w) => Object.values(w).some((v) => typeof v === "number" && v > 0), { message: "at least one outcome weight must be above 0" });
}

export const MotionParamsSchema = z.object({
  forward: outcomeWeights({ ok: weight, stall: weight, over: weight }),
  turn: outcomeWeights({ ok: weight, none: weight, reverse: weight }),
  mix: SettingField.mix,
  cost: z.object({
    forward: z.number().positive("must be above 0").max(100, "must be at most 100"),
    turn: z.number().positive("must be above 0").max(100, "must be at most 100"),
    bump: z.number().min(0, "must be 0 or more").max(1000, "must be at most 1000"),
  }),
});

export const SensingParamsSchema = z.object({
  range: z.object({
    sigmaM: SettingField.sigmaM,
    lambdaShort: SettingField.lambdaShort,
    weights: z
      .object({ hit: weight, short: weight, max: weight, rand: weight })
      .refine((w) => Math.abs(w.hit + w.short + w.max + w.rand - 1) <= WEIGHT_SUM_TOLERANCE, { message: "hit, short, max and rand must add up to 1" }),
  }),
  floor: z.object({ hit: SettingField.floorHit }),
});

const gain = z.number().min(0, "must be 0 or more").max(1000, "must be at most 1000");

export const HeadingGainsSchema = z.object({ kp: gain, ki: gain, kd: gain });

/** The whole of a robot's tuning, as PUT /api/robots/[id]/settings takes it. */
export const RobotSettingsSchema = z.object({
  motion: MotionParamsSchema,
  sensing: SensingParamsSchema,
  gains: HeadingGainsSchema,
});

export type MotionParams = z.infer<typeof MotionParamsSchema>;
export type SensingParams = z.infer<typeof SensingParamsSchema>;
export type RobotSettings = z.infer<typeof RobotSettingsSchema>;

/** The defaults of lib/ for a drive: defaultMotion (without its drive), defaultSensorModel, defaultHeadingGains. */
export function defaultRobotSettings(drive: Drive): RobotSettings {
  const m = defaultMotion(drive);
  return { motion: { forward: m.forward, turn: m.turn, mix: m.mix, cost: m.cost }, sensing: defaultSensorModel(), gains: defaultHeadingGains() };
}

/**
 * The settings a robot runs with: each stored section that passes its schema, the drive's
 * defaults for the rest. `custom` lists the sections that came from storage.
 */
export function resolveRobotSettings(drive: Drive, stored: unknown): { settings: RobotSettings; custom: (keyof RobotSettings)[] } {
  const defaults = defaultRobotSettings(drive);
  const raw = stored && typeof stored === "object" ? (stored as Record<string, unknown>) : {};
  const motion = MotionParamsSchema.safeParse(raw.motion);
  const sensing = SensingParamsSchema.safeParse(raw.sensing);
  const gains = HeadingGainsSchema.safeParse(raw.gains);
  const custom: (keyof RobotSettings)[] = [];
  if (motion.success) custom.push("motion");
  if (sensing.success) custom.push("sensing");
  if (gains.success) custom.push("gains");
  return {
    settings: {
      motion: motion.success ? motion.data : defaults.motion,
      sensing: sensing.success ? sensing.data : defaults.sensing,
      gains: gains.success ? gains.data : defaults.gains,
    },
    custom,
  };
}

/** The motion model the filter and planner use: the stored parameters on the robot's drive. */
export function motionModelOf(drive: Drive, settings: RobotSettings): MotionModel {
  return { drive, ...settings.motion };
}

/** The sensor model the filter uses. */
export function sensorModelOf(settings: RobotSettings): SensorModel {
  return settings.sensing;
}
