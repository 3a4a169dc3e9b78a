"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { z } from "zod";
import type { SensorSpec } from "@/lib/sensing";
import { MAX_SENSORS, type RegisterRobotInput } from "@/lib/roster";
import { DRIVES } from "@/lib/vocabulary";
import { rosterCall } from "./api";

const number = (what: string) => z.number({ error: `${what} must be a number` });

/** One sensor row of the form; range fields are ignored for a floor sensor. */
const SensorRowSchema = z
  .object({
    id: z.string().trim().min(1, "give the sensor an id").max(32, "at most 32 characters"),
    kind: z.enum(["range", "floor"]),
    bearingDeg: number("bearing"),
    maxRangeM: number("range"),
  })
  .superRefine((row, ctx) => {
    if (row.kind !== "range") return;
    if (row.bearingDeg < -180 || row.bearingDeg > 180) ctx.addIssue({ code: "custom", path: ["bearingDeg"], message: "bearing is from −180° to 180°" });
    if (!(row.maxRangeM > 0) || row.maxRangeM > 50) ctx.addIssue({ code: "custom", path: ["maxRangeM"], message: "range is above 0 m and at most 50 m" });
  });

const RegisterFormSchema = z
  .object({
    name: z.string().trim().min(1, "give the robot a name").max(80, "at most 80 characters"),
    drive: z.enum(DRIVES),
    floorplanId: z.string(),
    simulated: z.boolean(),
    sensors: z.array(SensorRowSchema).max(MAX_SENSORS, `at most ${MAX_SENSORS} sensors`),
  })
  .superRefine((form, ctx) => {
    const seen = new Set<string>();
    form.sensors.forEach((s, i) => {
      if (seen.has(s.id.trim())) ctx.addIssue({ code: "custom", path: ["sensors", i, "id"], message: "another sensor has this id" });
      seen.add(s.id.trim());
    });
  });

type RegisterForm = z.infer<typeof RegisterFormSchema>;
type SensorRow = RegisterForm["sensors"][number];

const STARTING_SENSORS: SensorRow[] = [
  { id: "us-front", kind: "range", bearingDeg: 0, maxRangeM: 3 },
  { id: "us-left", kind: "range", bearingDeg: 90, maxRangeM: 3 },
  { id: "us-right", kind: "range", bearingDeg: -90, maxRangeM: 3 },
  { id: "floor", kind: "floor", bearingDeg: 0, maxRangeM: 0 },
];

function toInput(form: RegisterForm): RegisterRobotInput {
  const sensors: SensorSpec[] = form.sensors.map((s) => (s.kind === "range" ? { id: s.id.trim(), kind: "range", bearingDeg: s.bearingDeg, maxRangeM: s.maxRangeM } : { id: s.id.trim(), kind: "floor" }));
  return { name: form.name.trim(), drive: form.drive, sensors, simulated: form.simulated, ...(form.floorplanId ? { floorplanId: Number(form.floorplanId) } : {}) };
}

export interface Registered {
  robot: { id: string; name: string };
  key: string;
}

const inputClass = "rounded border border-ink-700 bg-ink-950 px-2 py-1 text-sm";

function FieldError({ message }: { message?: string }) {
  return message ? <span className="text-xs text-coral">{message}</span> : null;
}

/** Registers a robot; the answer's key goes to `onRegistered`, which shows it once. */
export function RegisterRobotForm({ floorplans, onRegistered, onCancel }: { floorplans: { id: number; name: string }[]; onRegistered: (r: Registered) => void; onCancel: () => void }) {
  const [serverError, setServerError] = useState<string | null>(null);
  const { register, control, handleSubmit, watch, setError, formState } = useForm<RegisterForm>({
    resolver: zodResolver(RegisterFormSchema),
    defaultValues: { name: "", drive: "differential", floorplanId: floorplans[0] ? String(floorplans[0].id) : "", simulated: false, sensors: STARTING_SENSORS },
  });
  const sensors = useFieldArray({ control, name: "sensors" });
  const errors = formState.errors;

  const submit = handleSubmit(async (form) => {
    setServerError(null);
    const result = await rosterCall<Registered>("POST", "/api/robots", toInput(form));
    if (result.ok) {
      onRegistered(result.data);
      return;
    }
    for (const [path, messages] of Object.entries(result.error.fields ?? {})) {
      if (path === "name" || path === "drive" || path === "floorplanId" || path.startsWith("sensors")) setError(path as "name", { message: messages.join("; ") });
    }
    setServerError(result.error.message);
  });

  return (
    <form aria-label="Register a robot" onSubmit={(e) => void submit(e)} className="space-y-4 rounded-md border border-ink-700 bg-ink-900 p-4" noValidate>
      <h2 className="text-base font-semibold">Register a robot</h2>
      <div className="flex flex-wrap gap-4">
        <label className="flex flex-col gap-1 text-sm">
          <span className="text-ink-500">Name</span>
          <input {...register("name")} aria-label="Name" aria-invalid={Boolean(errors.name)} className={inputClass} autoComplete="off" />
          <FieldError message={errors.name?.message} />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="text-ink-500">Drive</span>
          <select {...register("drive")} aria-label="Drive" className={inputClass}>
            <option value="differential">Differential</option>
            <option value="bicycle">Bicycle</option>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="text-ink-500">Floorplan</span>
          <select {...register("floorplanId")} aria-label="Floorplan" className={inputClass}>
            {floorplans.map((f) => (
              <option key={f.id} value={String(f.id)}>
                {f.name}
              </option>
            ))}
          </select>
          <FieldError message={errors.floorplanId?.message} />
        </label>
        <fieldset className="flex flex-col gap-1 text-sm">
          <legend className="text-ink-500">Kind</legend>
          <label className="flex items-center gap-2 pt-1.5">
            <input type="checkbox" {...register("simulated")} aria-label="Simulated robot" />
            <span>Simulated (a software robot; hardware otherwise)</span>
          </label>
        </fieldset>
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm text-ink-500">Sensors (bearing counter-clockwise from the heading, as the robot announces them in hello)</legend>
        <table className="w-full text-sm">
          <thead className="text-left text-xs text-ink-500">
            <tr>
              <th className="py-1 font-medium">Id</th>
              <th className="font-medium">Kind</th>
              <th className="font-medium">Bearing (°)</th>
              <th className="font-medium">Max range (m)</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {sensors.fields.map((field, i) => {
              const kind = watch(`sensors.${i}.kind`);
              const rowErrors = errors.sensors?.[i];
              return (
                <tr key={field.id} className="border-t border-ink-800 align-top">
                  <td className="py-1 pr-2">
                    <input {...register(`sensors.${i}.id`)} aria-label={`Sensor ${i + 1} id`} className={`${inputClass} w-32 font-mono`} />
                    <FieldError message={rowErrors?.id?.message} />
                  </td>
                  <td className="py-1 pr-2">
                    <select {...register(`sensors.${i}.kind`)} aria-label={`Sensor ${i + 1} kind`} className={inputClass}>
                      <option value="range">Range</option>
                      <option value="floor">Floor</option>
                    </select>
                  </td>
                  <td className="py-1 pr-2">
                    <input
                      type="number"
                      step="any"
                      {...register(`sensors.${i}.bearingDeg`, { valueAsNumber: true })}
                      aria-label={`Sensor ${i + 1} bearing`}
                      readOnly={kind !== "range"}
                      className={`${inputClass} w-24 font-mono read-only:opacity-40`}
                    />
                    <FieldError message={rowErrors?.bearingDeg?.message} />
                  </td>
                  <td className="py-1 pr-2">
                    <input
                      type="number"
                      step="any"
                      {...register(`sensors.${i}.maxRangeM`, { valueAsNumber: true })}
                      aria-label={`Sensor ${i + 1} max range`}
                      readOnly={kind !== "range"}
                      className={`${inputClass} w-24 font-mono read-only:opacity-40`}
                    />
                    <FieldError message={rowErrors?.maxRangeM?.message} />
                  </td>
                  <td className="py-1 text-right">
                    <button type="button" onClick={() => sensors.remove(i)} aria-label={`Remove sensor ${i + 1}`} className="rounded px-2 py-1 text-xs text-ink-500 hover:text-coral">
                      Remove
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <FieldError message={errors.sensors?.message ?? errors.sensors?.root?.message} />
        <button
          type="button"
          disabled={sensors.fields.length >= MAX_SENSORS}
          onClick={() => sensors.append({ id: `us-${sensors.fields.length + 1}`, kind: "range", bearingDeg: 0, maxRangeM: 3 })}
          className="rounded-md border border-ink-700 px-3 py-1 text-sm text-ink-300 hover:text-ink-100 disabled:opacity-40"
        >
          Add sensor
        </button>
      </fieldset>

      {serverError && (
        <p role="alert" className="text-sm text-coral">
          {serverError}
        </p>
      )}
      <div className="flex gap-2">
        <button type="submit" disabled={formState.isSubmitting} className="rounded-md border border-tide/60 bg-tide/10 px-3 py-1 text-sm text-tide hover:bg-tide/20 disabled:opacity-50">
          {formState.isSubmitting ? "Registering…" : "Register robot"}
        </button>
        <button type="button" onClick={onCancel} className="rounded-md border border-ink-700 px-3 py-1 text-sm text-ink-300 hover:text-ink-100">
          Cancel
        </button>
      </div>
    </form>
  );
}
