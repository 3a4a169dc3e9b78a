import { describe, expect, it } from "vitest";
import { defaultHeadingGains } from "../control";
import { defaultMotion } from "../motion";
import { defaultSensorModel } from "../sensing";
import { defaultRobotSettings, motionModelOf, resolveRobotSettings, RobotSettingsSchema, type RobotSettings } from "./settings";

/** Messages by dotted field path, as the routes report them. */
function zodFields(error: { issues: { path: PropertyKey[]; message: string }[] }): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const issue of error.issues) (fields[issue.path.map(String).join(".")] ??= []).push(issue.message);
  return fields;
}

function tuned(): RobotSettings {
  return {
    motion: { forward: { ok: 0.7, stall: 0.2, over: 0.1 }, turn: { ok: 0.85, none: 0.1, reverse: 0.05 }, mix: 0.01, cost: { forward: 1, turn: 0.7, bump: 8 } },
    sensing: { range: { sigmaM: 0.06, lambdaShort: 1.2, weights: { hit: 0.7, short: 0.15, max: 0.05, rand: 0.1 } }, floor: { hit: 0.85 } },
    gains: { kp: 4.5, ki: 0.25, kd: 0.08 },
  };
}

describe("robot settings defaults", () => {
  it("take the motion model of the drive, the default sensor model and the default gains", () => {
    const bicycle = defaultRobotSettings("bicycle");
    const { drive, ...motion } = defaultMotion("bicycle");
    expect(drive).toBe("bicycle");
    expect(bicycle.motion).toEqual(motion);
    expect(bicycle.motion.turn).toEqual({ ok: 0.8, none: 0.12, reverse: 0.08 });
    expect(defaultRobotSettings("differential").motion.turn).toEqual({ ok: 0.9, none: 0.06, reverse: 0.04 });
    expect(bicycle.sensing).toEqual(defaultSensorModel());
    expect(bicycle.gains).toEqual(defaultHeadingGains());
    expect(bicycle.gains).toEqual({ kp: 6, ki: 1.5, kd: 0.05 });
  });

  it("pass their own schema for both drives", () => {
    expect(RobotSettingsSchema.safeParse(defaultRobotSettings("differential")).success).toBe(true);
    expect(RobotSettingsSchema.safeParse(defaultRobotSettings("bicycle")).success).toBe(true);
  });

  it("put the robot's drive back on the motion model", () => {
    expect(motionModelOf("bicycle", tuned())).toEqual({ drive: "bicycle", ...tuned().motion });
  });
});

describe("robot settings schema", () => {
  it("names the field of each bad value", () => {
    const bad = tuned();
    bad.motion.mix = 0.7;
    bad.sensing.range.sigmaM = -0.01;
    bad.gains.kd = -1;
    const parsed = RobotSettingsSchema.safeParse(bad);
    expect(parsed.success).toBe(false);
    const fields = zodFields(parsed.error!);
    expect(Object.keys(fields).sort()).toEqual(["gains.kd", "motion.mix", "sensing.range.sigmaM"]);
    expect(fields["motion.mix"]).toEqual(["must be under 0.5"]);
  });

  it("refuses beam weights that do not add up to 1, at the weights' path", () => {
    const bad = tuned();
    bad.sensing.range.weights = { hit: 0.7, short: 0.15, max: 0.05, rand: 0.2 };
    const parsed = RobotSettingsSchema.safeParse(bad);
    expect(zodFields(parsed.error!)).toEqual({ "sensing.range.weights": ["hit, short, max and rand must add up to 1"] });
  });

  it("accepts beam weights a form rounded within the tolerance", () => {
    const ok = tuned();
    ok.sensing.range.weights = { hit: 0.7000000001, short: 0.15, max: 0.05, rand: 0.1 };
    expect(RobotSettingsSchema.safeParse(ok).success).toBe(true);
  });

  it("refuses an outcome group whose weights are all zero", () => {
    const bad = tuned();
    bad.motion.forward = { ok: 0, stall: 0, over: 0 };
    expect(zodFields(RobotSettingsSchema.safeParse(bad).error!)).toEqual({ "motion.forward": ["at least one outcome weight must be above 0"] });
  });

  it("refuses a missing section and non-numbers", () => {
    const parsed = RobotSettingsSchema.safeParse({ motion: tuned().motion, gains: { kp: "6", ki: 1, kd: 0 } });
    expect(Object.keys(zodFields(parsed.error!)).sort()).toEqual(["gains.kp", "sensing"]);
  });
});

describe("resolving stored settings", () => {
  it("uses the defaults of the drive when nothing is stored", () => {
    expect(resolveRobotSettings("bicycle", null)).toEqual({ settings: defaultRobotSettings("bicycle"), custom: [] });
  });

  it("keeps every stored section that passes", () => {
    expect(resolveRobotSettings("differential", tuned())).toEqual({ settings: tuned(), custom: ["motion", "sensing", "gains"] });
  });

  it("falls back section by section when a stored section is broken", () => {
    const stored = { ...tuned(), sensing: { range: { sigmaM: 0 } } };
    const { settings, custom } = resolveRobotSettings("differential", stored);
    expect(custom).toEqual(["motion", "gains"]);
    expect(settings.sensing).toEqual(defaultSensorModel());
    expect(settings.motion).toEqual(tuned().motion);
    expect(settings.gains).toEqual({ kp: 4.5, ki: 0.25, kd: 0.08 });
  });
});
