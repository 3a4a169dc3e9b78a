"use client";

import { beliefMassAt } from "./belief";
import { tileKind, type TileKind } from "./geometry";
import { useFloor } from "./store";

const KIND_WORDS: Record<TileKind, string> = { free: "free", blocked: "blocked", nogo: "no-go", dock: "dock", mark: "floor mark" };

/** A tile mass for reading: percentages, or scientific notation for the faint tails. */
function formatMass(mass: number): string {
  if (mass === 0) return "0 %";
  if (mass < 0.0005) return mass.toExponential(1);
  return `${(mass * 100).toFixed(mass < 0.01 ? 2 : 1)} %`;
}

/** The hovered tile's coordinates, kind and belief mass (selected robot, or summed over all robots). */
export function HoverReadout() {
  const hover = useFloor((s) => s.hover);
  const plan = useFloor((s) => s.floorplan);
  const mode = useFloor((s) => s.heatMode);
  const selectedName = useFloor((s) => (s.selectedId ? s.robots[s.selectedId]?.name : undefined));
  const mass = useFloor((s) => {
    if (!s.hover) return null;
    const { row, col } = s.hover;
    if (s.heatMode === "all") {
      const views = s.robotIds.map((id) => s.beliefs[id]).filter(Boolean);
      return views.length ? views.reduce((sum, v) => sum + beliefMassAt(v, row, col), 0) : null;
    }
    const view = s.selectedId ? s.beliefs[s.selectedId] : undefined;
    return view ? beliefMassAt(view, row, col) : null;
  });
  if (!hover) return <span className="text-ink-500">Point at a tile to read it</span>;
  const kind = tileKind(plan, hover.row, hover.col);
  const mark = plan.mark[hover.row * plan.cols + hover.col];
  return (
    <span data-testid="hover-readout" data-kind={kind} className="font-mono tabular-nums">
      <span className="text-ink-100">
        ({hover.row}, {hover.col})
      </span>{" "}
      <span className="text-ink-300">
        {KIND_WORDS[kind]}
        {kind !== "mark" && mark ? ` · mark ${mark}` : kind === "mark" ? ` ${mark}` : ""}
      </span>
      {mass !== null && (
        <span className="ml-3 text-tide">
          {mode === "all" ? "Σ all robots" : selectedName}: {formatMass(mass)}
        </span>
      )}
    </span>
  );
}
