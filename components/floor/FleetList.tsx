"use client";

import clsx from "clsx";
import { memo } from "react";
import { Age, Battery, Certainty, Sparkline, StatePill } from "./bits";
import { useFloor } from "./store";

/** One compact fleet card; subscribes to its own robot only. */
const FleetCard = memo(function FleetCard({ robotId }: { robotId: string }) {
  const robot = useFloor((s) => s.robots[robotId]);
  const selected = useFloor((s) => s.selectedId === robotId);
  const select = useFloor((s) => s.select);
  if (!robot) return null;
  return (
    <li>
      <button
        type="button"
        data-testid={`fleet-card-${robotId}`}
        aria-pressed={selected}
        onClick={() => select(robotId)}
        className={clsx(
          "w-full rounded-md border px-3 py-2 text-left",
          selected ? "border-tide bg-tide/5" : "border-ink-700 bg-ink-900 hover:border-ink-500",
          robot.state === "offline" && "opacity-70",
        )}
      >
        <span className="flex items-center justify-between gap-2">
          <span className="truncate font-semibold">{robot.name}</span>
          <StatePill robot={robot} />
        </span>
        <span className="mt-1.5 flex items-center justify-between gap-2">
          <Certainty value={robot.estimate?.tileMass ?? null} />
          <Sparkline values={robot.certaintyHistory} width={56} height={14} />
        </span>
        <span className="mt-1 flex items-center justify-between gap-2 text-xs text-ink-300">
          <span className="font-mono tabular-nums">{robot.mission ? `→ (${robot.mission.goal.row}, ${robot.mission.goal.col}) · step ${robot.mission.step}` : "no mission"}</span>
          <span className="flex items-center gap-2">
            <Battery value={robot.battery} />
            <Age at={robot.lastMessageAt} />
          </span>
        </span>
      </button>
    </li>
  );
});

/** Every robot on this floor as compact cards, in name order. */
export function FleetList() {
  const robotIds = useFloor((s) => s.robotIds);
  return (
    <ul className="space-y-1.5" aria-label="Robots on this floor">
      {robotIds.map((id) => (
        <FleetCard key={id} robotId={id} />
      ))}
    </ul>
  );
}
