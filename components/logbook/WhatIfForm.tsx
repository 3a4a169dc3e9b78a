"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { z } from "zod";
import type { WhatIf } from "@/lib/protocol/what-if";
import { SettingField } from "@/lib/roster/settings";

/** The robot's models as the form starts from them (lib/motion MotionModel and lib/sensing SensorModel). */
export interface ModelValues {
  motion: { forward: { ok: number; stall: number; over: number }; turn: { ok: number; none: number; reverse: number }; mix: number };
  sensor: { range: { sigmaM: number; lambdaShort: number; weights: { hit: number; short: number; max: number; rand: number } }; floor: { hit: number } };
}

/** A form field: a number first (an empty input is NaN), then the bounds the settings declare. */
const field = (bounds: z.ZodNumber) => z.number({ error: "must be a number" }).pipe(bounds);
const unit = field(SettingField.weight);
const FormSchema = z
  .object({
    forwardOk: unit,
    forwardStall: unit,
    forwardOver: unit,
    turnOk: unit,
    turnNone: unit,
    turnReverse: unit,
    mix: field(SettingField.mix),
    sigmaM: field(SettingField.sigmaM),
    lambdaShort: field(SettingField.lambdaShort),
    wHit: unit,
    wShort: unit,
    wMax: unit,
    wRand: unit,
    floorHit: field(SettingField.floorHit),
  })
  .refine((v) => v.forwardOk + v.forwardStall + v.forwardOver > 0, { path: ["forwardOk"], message: "forward outcomes need a positive sum" })
  .refine((v) => v.turnOk + v.turnNone + v.turnReverse > 0, { path: ["turnOk"], message: "turn outcomes need a positive sum" })
  .refine((v) => Math.abs(v.wHit + v.wShort + v.wMax + v.wRand - 1) < 1e-6, { path: ["wHit"], message: "the beam weights must sum to 1" });
type FormValues = z.infer<typeof FormSchema>;

function toForm(m: ModelValues): FormValues {
  const { forward, turn, mix } = m.motion;
  const { range, floor } = m.sensor;
  return {
    forwardOk: forward.ok,
    forwardStall: forward.stall,
    forwardOver: forward.over,
    turnOk: turn.ok,
    turnNone: turn.none,
    turnReverse: turn.reverse,
    mix,
    sigmaM: range.sigmaM,
    lambdaShort: range.lambdaShort,
    wHit: range.weights.hit,
    wShort: range.weights.short,
    wMax: range.weights.max,
    wRand: range.weights.rand,
    floorHit: floor.hit,
  };
}

function toWhatIf(v: FormValues): WhatIf {
  return {
    motion: { forward: { ok: v.forwardOk, stall: v.forwardStall, over: v.forwardOver }, turn: { ok: v.turnOk, none: v.turnNone, reverse: v.turnReverse }, mix: v.mix },
    sensor: { range: { sigmaM: v.sigmaM, lambdaShort: v.lambdaShort, weights: { hit: v.wHit, short: v.wShort, max: v.wMax, rand: v.wRand } }, floor: { hit: v.floorHit } },
  };
}

const GROUPS: { title: string; fields: [keyof FormValues, string, number][] }[] = [
  { title: "Forward", fields: [["forwardOk", "one tile", 0.01], ["forwardStall", "stall", 0.01], ["forwardOver", "overshoot", 0.01]] },
  { title: "Turn", fields: [["turnOk", "as told", 0.01], ["turnNone", "no turn", 0.01], ["turnReverse", "too far", 0.01]] },
  { title: "Recovery", fields: [["mix", "mixing", 0.001]] },
  { title: "Range beam", fields: [["sigmaM", "σ (m)", 0.005], ["lambdaShort", "λ short (/m)", 0.1]] },
  { title: "Beam weights", fields: [["wHit", "hit", 0.01], ["wShort", "short", 0.01], ["wMax", "max", 0.01], ["wRand", "random", 0.01]] },
  { title: "Floor sensor", fields: [["floorHit", "reads true mark", 0.01]] },
];

/**
 * Motion and sensor parameters to replay the mission with, starting from the robot's own.
 * Nothing is saved: the robot keeps its settings until an admin changes them in the roster.
 */
export function WhatIfForm({ models, busy, onRun, onClear }: { models: ModelValues; busy: boolean; onRun: (w: WhatIf) => void; onClear: () => void }) {
  const form = useForm<FormValues>({ resolver: zodResolver(FormSchema), defaultValues: toForm(models) });
  const errors = form.formState.errors;
  return (
    <form className="space-y-3 rounded-md border border-ink-700 p-3 text-sm" aria-label="What-if parameters" onSubmit={form.handleSubmit((v) => onRun(toWhatIf(v)))}>
      <div className="flex flex-wrap gap-x-6 gap-y-3">
        {GROUPS.map((g) => (
          <fieldset key={g.title} className="space-y-1">
            <legend className="text-xs uppercase tracking-wide text-ink-500">{g.title}</legend>
            <div className="flex gap-2">
              {g.fields.map(([name, label, step]) => (
                <label key={name} className="flex flex-col gap-0.5 text-xs text-ink-300">
                  {label}
                  <input
                    type="number"
                    step={step}
                    aria-label={`${g.title} ${label}`}
                    aria-invalid={errors[name] ? true : undefined}
                    className="w-20 rounded border border-ink-700 bg-ink-800 px-1.5 py-0.5 font-mono text-ink-100"
                    {...form.register(name, { valueAsNumber: true })}
                  />
                  {errors[name] && <span className="text-coral">{errors[name]?.message}</span>}
                </label>
              ))}
            </div>
          </fieldset>
        ))}
      </div>
      <div className="flex gap-2">
        <button type="submit" disabled={busy} className="rounded-md bg-tide px-3 py-1 font-medium text-ink-950 disabled:opacity-50">
          {busy ? "Replaying…" : "Replay with these parameters"}
        </button>
        <button
          type="button"
          className="rounded-md border border-ink-700 px-3 py-1"
          onClick={() => {
            form.reset(toForm(models));
            onClear();
          }}
        >
          Back to the robot&apos;s own
        </button>
      </div>
    </form>
  );
}
