"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { useFloorCommands } from "./commands";

/** The form's fields as typed; turned into one fault message on submit. */
const FaultFormSchema = z
  .object({
    kind: z.enum(["kidnap", "stall", "drop", "drain"]),
    row: z.coerce.number<string>().int().min(0).optional(),
    col: z.coerce.number<string>().int().min(0).optional(),
    seconds: z.coerce.number<string>().positive("More than 0 s").max(600, "At most 600 s").optional(),
  })
  .refine((f) => f.kind !== "kidnap" || (f.row !== undefined && f.col !== undefined), { message: "Kidnap needs a row and a column", path: ["row"] });
type FaultForm = z.input<typeof FaultFormSchema>;

const field = "w-16 rounded border border-ink-700 bg-ink-800 px-2 py-1 text-sm";

/** Admins' fault injection for a simulated robot: kidnap, stall a wheel, drop the link, drain the battery. */
export function SimFaults({ robotId }: { robotId: string }) {
  const commands = useFloorCommands();
  const { register, handleSubmit, watch, formState } = useForm<FaultForm, unknown, z.output<typeof FaultFormSchema>>({
    resolver: zodResolver(FaultFormSchema),
    defaultValues: { kind: "kidnap" },
  });
  const kind = watch("kind");
  const emptyAsUndefined = { setValueAs: (v: string) => (v === "" ? undefined : v) };
  return (
    <form
      aria-label="Simulator faults"
      className="space-y-2 border-t border-ink-700 pt-3"
      onSubmit={handleSubmit((f) => {
        const fault =
          f.kind === "kidnap"
            ? { kind: "kidnap" as const, row: f.row as number, col: f.col as number }
            : f.kind === "drain"
              ? { kind: "drain" as const }
              : { kind: f.kind, seconds: f.seconds ?? 5 };
        void commands.injectFault(robotId, fault);
      })}
    >
      <p className="text-xs text-ink-500">Simulator faults (admin): test how the floor reacts.</p>
      <div className="flex flex-wrap items-start gap-2">
        <select aria-label="Fault" className="rounded border border-ink-700 bg-ink-800 px-2 py-1 text-sm" {...register("kind")}>
          <option value="kidnap">Kidnap to tile</option>
          <option value="stall">Stall a wheel</option>
          <option value="drop">Drop the link</option>
          <option value="drain">Drain the battery</option>
        </select>
        {kind === "kidnap" && (
          <>
            <input aria-label="Kidnap row" placeholder="row" inputMode="numeric" className={field} {...register("row", emptyAsUndefined)} />
            <input aria-label="Kidnap column" placeholder="col" inputMode="numeric" className={field} {...register("col", emptyAsUndefined)} />
          </>
        )}
        {(kind === "stall" || kind === "drop") && <input aria-label="Seconds" placeholder="5 s" inputMode="numeric" className={field} {...register("seconds", emptyAsUndefined)} />}
        <button type="submit" className="rounded-md border border-coral/60 px-2.5 py-1 text-sm text-coral hover:bg-coral/10">
          Inject
        </button>
      </div>
      {(formState.errors.row ?? formState.errors.seconds) && (
        <p className="text-xs text-coral">{formState.errors.row?.message ?? formState.errors.seconds?.message}</p>
      )}
    </form>
  );
}
