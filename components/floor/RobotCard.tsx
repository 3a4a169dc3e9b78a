"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import clsx from "clsx";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { useFloorCommands } from "./commands";
import { Age, Battery, Certainty, Kbd, Sparkline, StatePill } from "./bits";
import { goalRefusal } from "./geometry";
import { SimFaults } from "./SimFaults";
import { useFloor, useFloorStore } from "./store";

const GoalFormSchema = z.object({
  row: z.coerce.number<string>().int("Whole tiles only").min(0, "0 or more"),
  col: z.coerce.number<string>().int("Whole tiles only").min(0, "0 or more"),
});
type GoalForm = z.input<typeof GoalFormSchema>;

const button = "rounded-md border px-2.5 py-1 text-sm disabled:cursor-not-allowed disabled:opacity-40";

function GoalEntry({ robotId }: { robotId: string }) {
  const store = useFloorStore();
  const plan = useFloor((s) => s.floorplan);
  const { register, handleSubmit, formState } = useForm<GoalForm, unknown, z.output<typeof GoalFormSchema>>({ resolver: zodResolver(GoalFormSchema) });
  return (
    <form
      aria-label="Send to a typed tile"
      className="flex items-start gap-2"
      onSubmit={handleSubmit(({ row, col }) => {
        const refusal = goalRefusal(plan, row, col);
        if (refusal) store.getState().notify("error", refusal);
        else store.getState().setConfirm({ kind: "dispatch", robotId, goal: { row, col } });
      })}
    >
      <label className="flex flex-col text-xs text-ink-300">
        Row
        <input {...register("row")} id="goal-row" inputMode="numeric" className="mt-0.5 w-16 rounded border border-ink-700 bg-ink-950 px-1.5 py-1 font-mono text-sm text-ink-100" aria-invalid={Boolean(formState.errors.row)} />
        {formState.errors.row && <span className="text-coral">{formState.errors.row.message}</span>}
      </label>
      <label className="flex flex-col text-xs text-ink-300">
        Column
        <input {...register("col")} inputMode="numeric" className="mt-0.5 w-16 rounded border border-ink-700 bg-ink-950 px-1.5 py-1 font-mono text-sm text-ink-100" aria-invalid={Boolean(formState.errors.col)} />
        {formState.errors.col && <span className="text-coral">{formState.errors.col.message}</span>}
      </label>
      <button type="submit" className={clsx(button, "mt-4 border-tide/60 text-tide hover:bg-tide/10")}>
        Send…
      </button>
    </form>
  );
}

/** The selected robot in full, with its commands and their shortcuts (operators and admins). */
export function RobotCard() {
  const store = useFloorStore();
  const robot = useFloor((s) => (s.selectedId ? s.robots[s.selectedId] : undefined));
  const pick = useFloor((s) => s.pick);
  const pending = useFloor((s) => (s.selectedId ? s.pendingGoals[s.selectedId] : undefined));
  const givingWayTo = useFloor((s) => {
    const id = s.selectedId ? s.robots[s.selectedId]?.mission?.givingWayTo : null;
    return id ? (s.robots[id]?.name ?? id) : null;
  });
  const commands = useFloorCommands();

  if (!robot) {
    return (
      <section aria-label="Selected robot" className="rounded-lg border border-dashed border-ink-700 p-4 text-sm text-ink-300">
        No robot selected. Click a robot on the map or in the fleet list, or press <Kbd>J</Kbd>.
      </section>
    );
  }
  const held = robot.state === "held";
  const online = robot.online && robot.state !== "offline";
  const relocating = pick.kind === "relocate";
  return (
    <section aria-label={`Selected robot ${robot.name}`} data-testid="robot-card" className="space-y-3 rounded-lg border border-ink-700 bg-ink-900 p-4">
      <header className="flex items-start justify-between gap-2">
        <div>
          <h2 className="text-lg font-semibold leading-tight">{robot.name}</h2>
          <p className="font-mono text-xs text-ink-500">
            {robot.robotId}
            {robot.simulated ? " · simulated" : ""}
          </p>
        </div>
        <StatePill robot={robot} />
      </header>

      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1.5 text-sm">
        <dt className="text-ink-500">Certainty</dt>
        <dd className="flex items-center gap-2">
          <Certainty value={robot.estimate?.tileMass ?? null} />
          <Sparkline values={robot.certaintyHistory} />
        </dd>
        <dt className="text-ink-500">Most likely</dt>
        <dd className="font-mono tabular-nums">
          {robot.estimate ? `(${robot.estimate.row}, ${robot.estimate.col}) facing ${robot.estimate.heading}` : "no estimate yet"}
          {robot.estimate && <span className="ml-2 text-xs text-ink-500">entropy {robot.estimate.entropy.toFixed(2)}</span>}
        </dd>
        <dt className="text-ink-500">Mission</dt>
        <dd data-testid="robot-card-mission" className="font-mono tabular-nums">
          {robot.mission
            ? `#${robot.mission.id} → (${robot.mission.goal.row}, ${robot.mission.goal.col}), step ${robot.mission.step}, ${givingWayTo ? `stepping aside for ${givingWayTo}` : `${robot.mission.route.length} tiles to go`}`
            : pending
              ? `sending → (${pending.row}, ${pending.col})…`
              : "none"}
        </dd>
        <dt className="text-ink-500">Battery</dt>
        <dd>
          <Battery value={robot.battery} />
        </dd>
        <dt className="text-ink-500">Last message</dt>
        <dd>
          <Age at={robot.lastMessageAt} /> ago
        </dd>
      </dl>

      {commands.canCommand ? (
        <div className="space-y-3 border-t border-ink-700 pt-3">
          <div className="flex flex-wrap gap-2">
            {held ? (
              <button type="button" className={clsx(button, "border-tide/60 text-tide hover:bg-tide/10")} disabled={!online} onClick={() => store.getState().setConfirm({ kind: "release", robotId: robot.robotId })}>
                Release… <Kbd>R</Kbd>
              </button>
            ) : (
              <button type="button" className={clsx(button, "border-amberline/60 text-amberline hover:bg-amberline/10")} disabled={!online} onClick={() => void commands.hold(robot.robotId)}>
                Hold <Kbd>H</Kbd>
              </button>
            )}
            <button
              type="button"
              className={clsx(button, relocating ? "border-amberline bg-amberline/15 text-amberline" : "border-ink-700 text-ink-300 hover:text-ink-100")}
              disabled={!held || !online}
              title={held ? "Pick a tile, then a heading, on the map" : "Hold the robot before giving a pose hint"}
              aria-pressed={relocating}
              onClick={() => store.getState().setPick(relocating ? { kind: "dispatch" } : { kind: "relocate", tile: null, heading: null })}
            >
              Re-locate <Kbd>L</Kbd>
            </button>
            <button type="button" className={clsx(button, "border-ink-700 text-ink-300 hover:text-ink-100")} disabled={!robot.mission} onClick={() => void commands.cancel(robot.robotId)}>
              Cancel mission <Kbd>C</Kbd>
            </button>
          </div>
          {relocating && (
            <p className="rounded border border-amberline/40 bg-amberline/10 px-2 py-1.5 text-xs text-amberline" role="status">
              {pick.tile ? `Tile (${pick.tile.row}, ${pick.tile.col}) chosen: pick a heading arrow on the map, or ? for unknown.` : "Click the tile where the robot really stands."} <Kbd>Esc</Kbd> to stop.
            </p>
          )}
          <div>
            <p className="mb-1 text-xs text-ink-500">
              Send to a tile: click it on the map, or type it (<Kbd>G</Kbd>)
            </p>
            <GoalEntry key={robot.robotId} robotId={robot.robotId} />
          </div>
        </div>
      ) : (
        <p className="border-t border-ink-700 pt-3 text-xs text-ink-500">Watching only: your role cannot dispatch, hold or release robots.</p>
      )}
      {commands.canInject && robot.simulated && online && <SimFaults key={robot.robotId} robotId={robot.robotId} />}
    </section>
  );
}
