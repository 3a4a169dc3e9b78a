"use client";

import { AxisBottom, AxisLeft } from "@visx/axis";
import { scaleLinear, scaleTime } from "@visx/scale";
import { LinePath } from "@visx/shape";
import type { CertaintyPoint } from "@/lib/roster";

const WIDTH = 560;
const HEIGHT = 160;
const MARGIN = { top: 8, right: 12, bottom: 24, left: 36 };

/** UTC clock labels: with seconds when the chart spans under ten minutes. */
function clockFormat(spanMs: number) {
  const end = spanMs < 10 * 60_000 ? 19 : 16;
  return (at: Date | number | { valueOf(): number }) => new Date(Number(at.valueOf())).toISOString().slice(11, end);
}

/**
 * Certainty (belief mass on the most likely tile) at the robot's recent belief snapshots,
 * against time (UTC), with the fleet's automatic hold and release levels dashed.
 */
export function CertaintyChart({ points, holdBelow, releaseAbove }: { points: CertaintyPoint[]; holdBelow: number; releaseAbove: number }) {
  if (points.length < 2) {
    return <p className="rounded border border-dashed border-ink-700 p-4 text-sm text-ink-500">Not enough belief snapshots yet to chart certainty; they are stored as the robot moves and senses.</p>;
  }
  const first = points[0].at;
  const last = points[points.length - 1].at;
  const x = scaleTime({ domain: [new Date(first), new Date(last === first ? first + 1000 : last)], range: [MARGIN.left, WIDTH - MARGIN.right] });
  const y = scaleLinear({ domain: [0, 1], range: [HEIGHT - MARGIN.bottom, MARGIN.top] });
  const lowest = Math.min(...points.map((p) => p.tileMass));
  return (
    <figure className="space-y-1">
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} className="w-full max-w-2xl" role="img" aria-label={`Certainty over the last ${points.length} belief snapshots, lowest ${Math.round(lowest * 100)} %`}>
        {[holdBelow, releaseAbove].map((level) => (
          <line key={level} x1={MARGIN.left} x2={WIDTH - MARGIN.right} y1={y(level)} y2={y(level)} className="stroke-ink-700" strokeDasharray="3 3" />
        ))}
        <LinePath data={points} x={(p) => x(new Date(p.at))} y={(p) => y(p.tileMass)} className="stroke-tide" strokeWidth={1.5} fill="none" />
        <g className="text-ink-500">
          <AxisLeft scale={y} left={MARGIN.left} numTicks={5} tickFormat={(v) => `${Math.round(Number(v) * 100)}%`} stroke="currentColor" tickStroke="currentColor" tickLabelProps={{ fill: "currentColor", fontSize: 10 }} />
          <AxisBottom scale={x} top={HEIGHT - MARGIN.bottom} numTicks={5} tickFormat={clockFormat(last - first)} stroke="currentColor" tickStroke="currentColor" tickLabelProps={{ fill: "currentColor", fontSize: 10 }} />
        </g>
      </svg>
      <figcaption className="text-xs text-ink-500">Certainty at the last {points.length} belief snapshots (UTC); dashed: hold under {Math.round(holdBelow * 100)} %, release above {Math.round(releaseAbove * 100)} %.</figcaption>
    </figure>
  );
}
