"use client";

import clsx from "clsx";
import { memo } from "react";
import { headingRotationDeg, ringFraction } from "./geometry";
import { useFloor } from "./store";

/** Body fill per state: teal under way, amber held, grey offline, plain otherwise. */
const BODY: Record<string, string> = {
  idle: "fill-ink-300",
  under_way: "fill-tide",
  held: "fill-amberline",
  arrived: "fill-tide/60",
  offline: "fill-ink-500",
};

/**
 * One robot on the map at its most likely tile: a body coloured by state, a heading
 * chevron, a certainty ring whose arc is the belief mass on that tile, and its name.
 * Subscribes to its own robot only, so another robot's frame does not re-render it.
 */
export const RobotMarker = memo(function RobotMarker({ robotId, labelSize }: { robotId: string; labelSize: number }) {
  const robot = useFloor((s) => s.robots[robotId]);
  const selected = useFloor((s) => s.selectedId === robotId);
  const select = useFloor((s) => s.select);
  if (!robot?.estimate) return null;
  const { row, col, heading, tileMass } = robot.estimate;
  const fraction = ringFraction(tileMass);
  const faulted = robot.holdReason === "fault";
  return (
    <g
      data-testid={`robot-marker-${robotId}`}
      data-row={row}
      data-col={col}
      role="button"
      aria-label={`${robot.name} at tile (${row}, ${col}), ${Math.round(fraction * 100)} % certain`}
      aria-pressed={selected}
      className="cursor-pointer"
      style={{ transform: `translate(${col + 0.5}px, ${row + 0.5}px)`, transition: "transform 260ms ease-out" }}
      onClick={(event) => {
        event.stopPropagation();
        select(robotId);
      }}
    >
      {selected && <circle r={0.68} className="fill-tide/15 stroke-tide" strokeWidth={0.06} />}
      <circle r={0.46} fill="none" className="stroke-ink-500/50" strokeWidth={0.09} />
      <circle
        r={0.46}
        fill="none"
        pathLength={1}
        strokeDasharray={`${fraction} 1`}
        transform="rotate(-90)"
        strokeLinecap="butt"
        className={fraction < 0.35 ? "stroke-amberline" : "stroke-ink-100"}
        strokeWidth={0.09}
      />
      <circle r={0.32} className={clsx(faulted ? "fill-coral" : BODY[robot.state], "stroke-ink-950")} strokeWidth={0.04} />
      <path d="M 0 -0.24 L 0.16 0.1 L 0 0.03 L -0.16 0.1 Z" transform={`rotate(${headingRotationDeg(heading)})`} className="fill-ink-950" />
      <text
        y={-0.68}
        textAnchor="middle"
        fontSize={labelSize}
        className={clsx("fill-ink-100 font-sans font-semibold", selected && "fill-tide")}
        stroke="rgb(var(--ink-950))"
        strokeWidth={labelSize * 0.28}
        paintOrder="stroke"
      >
        {robot.name}
      </text>
    </g>
  );
});
