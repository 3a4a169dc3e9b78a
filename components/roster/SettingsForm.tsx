"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm, type FieldPath } from "react-hook-form";
import { RobotSettingsSchema, type RobotSettings, type SettingsView } from "@/lib/roster";
import { SafetyCaution } from "@/components/floor/SafetyCaution";
import { rosterCall } from "./api";

type Path = FieldPath<RobotSettings>;

interface Field {
  path: Path;
  label: string;
  unit?: string;
}

const GROUPS: { title: string; note: string; fields: Field[] }[] = [
  {
    title: "Motion model",
    note: "Outcome weights of one tile action (each group is normalised), the mixing term spread over every free state after a move, and the planner's costs.",
    fields: [
      { path: "motion.forward.ok", label: "Forward: one tile" },
      { path: "motion.forward.stall", label: "Forward: stalls" },
      { path: "motion.forward.over", label: "Forward: two tiles" },
      { path: "motion.turn.ok", label: "Turn: as told" },
      { path: "motion.turn.none", label: "Turn: no turn" },
      { path: "motion.turn.reverse", label: "Turn: too far" },
      { path: "motion.mix", label: "Mixing" },
      { path: "motion.cost.forward", label: "Cost: forward" },
      { path: "motion.cost.turn", label: "Cost: turn" },
      { path: "motion.cost.bump", label: "Cost: bump" },
    ],
  },
  {
    title: "Sensor model",
    note: "Beam model of the range sensors (weights add up to 1) and the floor sensor's hit rate.",
    fields: [
      { path: "sensing.range.sigmaM", label: "Range noise σ", unit: "m" },
      { path: "sensing.range.lambdaShort", label: "Short-echo rate λ", unit: "/m" },
      { path: "sensing.range.weights.hit", label: "Weight: hit" },
      { path: "sensing.range.weights.short", label: "Weight: short" },
      { path: "sensing.range.weights.max", label: "Weight: no echo" },
      { path: "sensing.range.weights.rand", label: "Weight: random" },
      { path: "sensing.floor.hit", label: "Floor mark read right" },
    ],
  },
  {
    title: "Heading controller",
    note: "PID gains of the robot's heading hold: turn rate in rad/s per rad of error (kp), per rad·s (ki), per rad/s (kd).",
    fields: [
      { path: "gains.kp", label: "kp" },
      { path: "gains.ki", label: "ki" },
      { path: "gains.kd", label: "kd" },
    ],
  },
];

const SECTION_NAMES: Record<keyof RobotSettings, string> = { motion: "motion model", sensing: "sensor model", gains: "heading gains" };

/** Group-level errors (weights that do not add up) sit on these paths rather than on one field. */
const GROUP_PATHS: Path[] = ["motion.forward", "motion.turn", "sensing.range.weights"];

function errorAt(errors: unknown, path: string): string | undefined {
  let node = errors as Record<string, unknown> | undefined;
  for (const part of path.split(".")) node = node?.[part] as Record<string, unknown> | undefined;
  const message = node?.message;
  return typeof message === "string" ? message : undefined;
}

/**
 * A robot's motion and sensor parameters and heading gains. Saving applies them to the
 * live filter at once; "push" sends the saved gains to the connected robot with `tune`.
 */
export function SettingsForm({ view, canEdit, online }: { view: SettingsView; canEdit: boolean; online: boolean }) {
  const [custom, setCustom] = useState(view.custom);
  const [status, setStatus] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const form = useForm<RobotSettings>({ resolver: zodResolver(RobotSettingsSchema), defaultValues: view.settings });
  const { register, handleSubmit, reset, setError, formState } = form;

  const save = handleSubmit(async (settings) => {
    const result = await rosterCall<SettingsView>("PUT", `/api/robots/${encodeURIComponent(view.robotId)}/settings`, settings);
    if (!result.ok) {
      for (const [path, messages] of Object.entries(result.error.fields ?? {})) setError(path as Path, { message: messages.join("; ") });
      setStatus({ tone: "error", text: result.error.message });
      return;
    }
    reset(result.data.settings);
    setCustom(result.data.custom);
    setStatus({ tone: "ok", text: "Saved. The live filter uses these parameters from its next update." });
  });

  const restoreDefaults = async () => {
    const result = await rosterCall<SettingsView>("DELETE", `/api/robots/${encodeURIComponent(view.robotId)}/settings`);
    if (!result.ok) {
      setStatus({ tone: "error", text: result.error.message });
      return;
    }
    reset(result.data.settings);
    setCustom(result.data.custom);
    setStatus({ tone: "ok", text: "Back to the defaults for this drive, and applied." });
  };

  const push = async () => {
    const result = await rosterCall<{ gains: RobotSettings["gains"] }>("POST", `/api/robots/${encodeURIComponent(view.robotId)}/tune`);
    if (!result.ok) {
      setStatus({ tone: "error", text: result.error.message });
      return;
    }
    const g = result.data.gains;
    setStatus({ tone: "ok", text: `Gains sent to the robot: kp ${g.kp}, ki ${g.ki}, kd ${g.kd}.` });
  };

  return (
    <form aria-label="Robot settings" onSubmit={(e) => void save(e)} className="space-y-4" noValidate>
      <p className="text-xs text-ink-500">
        {custom.length === 0 ? "All defaults of the library for this drive." : `Differs from the defaults: ${custom.map((k) => SECTION_NAMES[k]).join(", ")}.`}
      </p>
      {GROUPS.map((group) => (
        <fieldset key={group.title} className="rounded-md border border-ink-700 p-3">
          <legend className="px-1 text-sm font-semibold">{group.title}</legend>
          <p className="mb-2 text-xs text-ink-500">{group.note}</p>
          <div className="grid grid-cols-[repeat(auto-fill,minmax(10rem,1fr))] gap-3">
            {group.fields.map((f) => {
              const error = errorAt(formState.errors, f.path);
              return (
                <label key={f.path} className="flex flex-col gap-1 text-sm">
                  <span className="text-ink-500">
                    {f.label}
                    {f.unit ? ` (${f.unit})` : ""}
                  </span>
                  <input
                    type="number"
                    step="any"
                    aria-label={f.label}
                    readOnly={!canEdit}
                    aria-invalid={Boolean(error)}
                    {...register(f.path, { valueAsNumber: true })}
                    className="rounded border border-ink-700 bg-ink-950 px-2 py-1 font-mono text-sm aria-[invalid=true]:border-coral"
                  />
                  {error && <span className="text-xs text-coral">{error}</span>}
                </label>
              );
            })}
          </div>
          {GROUP_PATHS.filter((p) => group.fields.some((f) => f.path.startsWith(`${p}.`))).map((p) => {
            const error = errorAt(formState.errors, p);
            return error ? (
              <p key={p} className="mt-2 text-xs text-coral">
                {error}
              </p>
            ) : null;
          })}
        </fieldset>
      ))}
      {status && (
        <p role={status.tone === "error" ? "alert" : "status"} className={status.tone === "error" ? "text-sm text-coral" : "text-sm text-tide"}>
          {status.text}
        </p>
      )}
      {canEdit && (
        <div className="space-y-3">
          <div className="flex flex-wrap gap-2">
            <button type="submit" disabled={formState.isSubmitting} className="rounded-md border border-tide/60 bg-tide/10 px-3 py-1 text-sm text-tide hover:bg-tide/20 disabled:opacity-50">
              Save settings
            </button>
            <button type="button" onClick={() => void restoreDefaults()} className="rounded-md border border-ink-700 px-3 py-1 text-sm text-ink-300 hover:text-ink-100">
              Reset to defaults
            </button>
            <button
              type="button"
              onClick={() => void push()}
              disabled={!online || formState.isDirty}
              title={formState.isDirty ? "Save first: the saved gains are pushed" : online ? undefined : "The robot is not connected"}
              className="rounded-md border border-amberline/60 px-3 py-1 text-sm text-amberline hover:bg-amberline/10 disabled:opacity-40"
            >
              Push gains to robot
            </button>
          </div>
          <SafetyCaution />
        </div>
      )}
    </form>
  );
}
