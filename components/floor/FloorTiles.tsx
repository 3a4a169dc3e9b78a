"use client";

import { memo, useMemo } from "react";
import type { FloorplanView } from "@/lib/protocol/ops-feed";
import { tileRuns, tilesOfKind } from "./geometry";

/** Fill classes of floor mark classes 1, 2, 3, …; the list repeats past its end. */
const MARK_FILLS = ["fill-ink-300", "fill-amberline/70", "fill-tide/70", "fill-coral/60"];

/** The floorplan drawn to scale in tile units: free floor with a tile grid, walls, no-go, docks and marks. */
export const FloorTiles = memo(function FloorTiles({ plan }: { plan: FloorplanView }) {
  const layers = useMemo(
    () => ({
      blocked: tileRuns(plan, "blocked"),
      nogo: tileRuns(plan, "nogo"),
      dock: tilesOfKind(plan, "dock"),
      mark: tilesOfKind(plan, "mark"),
      markedDocks: tilesOfKind(plan, "dock").filter((t) => t.mark > 0),
    }),
    [plan],
  );
  const grid = 0.03;
  return (
    <g aria-hidden>
      <defs>
        <pattern id="tessera-grid" width="1" height="1" patternUnits="userSpaceOnUse">
          <rect width="1" height="1" className="fill-ink-900" />
          <path d="M 1 0 L 0 0 0 1" fill="none" className="stroke-ink-700" strokeWidth={grid} />
        </pattern>
        <pattern id="tessera-nogo" width="0.5" height="0.5" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="0.5" height="0.5" className="fill-coral/10" />
          <line x1="0" y1="0" x2="0" y2="0.5" className="stroke-coral/60" strokeWidth={0.12} />
        </pattern>
      </defs>
      <rect x={0} y={0} width={plan.cols} height={plan.rows} fill="url(#tessera-grid)" />
      {layers.blocked.map(([row, col, n]) => (
        <rect key={`b${row}-${col}`} x={col} y={row} width={n} height={1} className="fill-ink-700" />
      ))}
      {layers.nogo.map(([row, col, n]) => (
        <rect key={`n${row}-${col}`} x={col} y={row} width={n} height={1} fill="url(#tessera-nogo)" />
      ))}
      {layers.dock.map((t) => (
        <g key={`d${t.row}-${t.col}`}>
          <rect x={t.col + 0.1} y={t.row + 0.1} width={0.8} height={0.8} rx={0.12} className="fill-tide/10 stroke-tide/70" strokeWidth={0.07} />
          <rect x={t.col + 0.3} y={t.row + 0.62} width={0.4} height={0.12} className="fill-tide/70" />
        </g>
      ))}
      {[...layers.mark, ...layers.markedDocks].map((t) => (
        <rect
          key={`m${t.row}-${t.col}`}
          x={t.col + 0.5 - 0.16}
          y={t.row + 0.5 - 0.16}
          width={0.32}
          height={0.32}
          transform={`rotate(45 ${t.col + 0.5} ${t.row + 0.5})`}
          className={MARK_FILLS[(t.mark - 1) % MARK_FILLS.length]}
        />
      ))}
      <rect x={0} y={0} width={plan.cols} height={plan.rows} fill="none" className="stroke-ink-500" strokeWidth={0.08} />
    </g>
  );
});

/** The legend under the map, matching the shapes above. */
export function FloorLegend({ markClasses }: { markClasses: number[] }) {
  return (
    <ul className="flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-ink-300" aria-label="Map legend">
      <li className="flex items-center gap-1.5">
        <span className="inline-block size-3 rounded-sm border border-ink-700 bg-ink-900" /> free
      </li>
      <li className="flex items-center gap-1.5">
        <span className="inline-block size-3 rounded-sm bg-ink-700" /> blocked
      </li>
      <li className="flex items-center gap-1.5">
        <span className="inline-block size-3 rounded-sm border border-coral/60 bg-coral/20" /> no-go
      </li>
      <li className="flex items-center gap-1.5">
        <span className="inline-block size-3 rounded-sm border border-tide/70 bg-tide/10" /> dock
      </li>
      {markClasses.map((c) => (
        <li key={c} className="flex items-center gap-1.5">
          <svg viewBox="0 0 1 1" className="size-3" aria-hidden>
            <rect x={0.25} y={0.25} width={0.5} height={0.5} transform="rotate(45 0.5 0.5)" className={MARK_FILLS[(c - 1) % MARK_FILLS.length]} />
          </svg>
          mark {c}
        </li>
      ))}
      <li className="flex items-center gap-1.5">
        <span className="inline-block size-3 rounded-sm border border-dashed border-amberline" /> claimed
      </li>
    </ul>
  );
}
