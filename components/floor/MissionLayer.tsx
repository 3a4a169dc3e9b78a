"use client";

import { memo } from "react";
import { useShallow } from "zustand/react/shallow";
import type { RobotFrame } from "@/lib/protocol/ops-feed";
import { routePoints, type TileCoord } from "./geometry";
import { useFloor } from "./store";

function GoalMark({ tile, strong, pending }: { tile: TileCoord; strong: boolean; pending?: boolean }) {
  const cx = tile.col + 0.5;
  const cy = tile.row + 0.5;
  return (
    <g data-testid={strong ? "selected-goal" : undefined} data-row={tile.row} data-col={tile.col} opacity={strong ? 1 : 0.45}>
      <rect x={tile.col + 0.08} y={tile.row + 0.08} width={0.84} height={0.84} fill="none" className="stroke-tide" strokeWidth={strong ? 0.1 : 0.06} strokeDasharray={pending ? "0.15 0.1" : undefined} />
      <path d={`M ${cx - 0.22} ${cy} H ${cx + 0.22} M ${cx} ${cy - 0.22} V ${cy + 0.22}`} className="stroke-tide" strokeWidth={0.07} />
    </g>
  );
}

/** Claimed tiles of every robot (dashed amber squares). */
const ClaimMarks = memo(function ClaimMarks() {
  const claims = useFloor(
    useShallow((s) =>
      s.robotIds
        .map((id) => s.robots[id]?.mission?.claim)
        .filter((c): c is TileCoord => Boolean(c))
        .map((c) => `${c.row},${c.col}`),
    ),
  );
  return (
    <g data-testid="claims">
      {claims.map((key) => {
        const [row, col] = key.split(",").map(Number);
        return <rect key={key} x={col + 0.04} y={row + 0.04} width={0.92} height={0.92} rx={0.1} fill="none" className="stroke-amberline" strokeWidth={0.07} strokeDasharray="0.18 0.1" />;
      })}
    </g>
  );
});

/** Goals of the robots that are not selected, faint. */
const OtherGoals = memo(function OtherGoals() {
  const goals = useFloor(
    useShallow((s) =>
      s.robotIds
        .filter((id) => id !== s.selectedId)
        .map((id) => s.robots[id]?.mission?.goal)
        .filter((g): g is TileCoord => Boolean(g))
        .map((g) => `${g.row},${g.col}`),
    ),
  );
  return (
    <g>
      {goals.map((key, i) => {
        const [row, col] = key.split(",").map(Number);
        return <GoalMark key={`${key}-${i}`} tile={{ row, col }} strong={false} />;
      })}
    </g>
  );
});

function SelectedMission({ robot, pending }: { robot: RobotFrame; pending: TileCoord | undefined }) {
  const mission = robot.mission;
  const from = robot.estimate ? { row: robot.estimate.row, col: robot.estimate.col } : null;
  return (
    <g>
      {mission && mission.route.length > 0 && (
        <polyline
          data-testid="selected-route"
          points={routePoints(mission.route, from)}
          fill="none"
          className="stroke-tide"
          strokeWidth={0.12}
          strokeLinejoin="round"
          strokeLinecap="round"
          opacity={0.85}
        />
      )}
      {mission && <GoalMark tile={mission.goal} strong />}
      {pending && (!mission || mission.goal.row !== pending.row || mission.goal.col !== pending.col) && <GoalMark tile={pending} strong pending />}
    </g>
  );
}

/** Routes, goals and claims; the selected robot's route and goal drawn strong. */
export function MissionLayer() {
  const robot = useFloor((s) => (s.selectedId ? s.robots[s.selectedId] : undefined));
  const pending = useFloor((s) => (s.selectedId ? s.pendingGoals[s.selectedId] : undefined));
  return (
    <g className="pointer-events-none">
      <ClaimMarks />
      <OtherGoals />
      {robot && <SelectedMission robot={robot} pending={pending} />}
    </g>
  );
}
