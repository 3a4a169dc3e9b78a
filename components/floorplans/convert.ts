/** Floorplans as the browser receives them (flat arrays of the view, the JSON form of a preview) turned into typed layers. */
import type { Floorplan } from "@/lib/floorplan/types";
import type { FloorplanView } from "@/lib/protocol/ops-feed";

/** The typed plan of a floorplan view (the shape GET /api/floorplans/[id] sends). */
export function planOfView(view: Pick<FloorplanView, "rows" | "cols" | "tileM" | "blocked" | "mark" | "dock" | "nogo">): Floorplan {
  return {
    rows: view.rows,
    cols: view.cols,
    tileM: view.tileM,
    blocked: Uint8Array.from(view.blocked),
    mark: Uint8Array.from(view.mark),
    dock: Uint8Array.from(view.dock),
    nogo: Uint8Array.from(view.nogo),
  };
}

/** Mark classes present in a plan, ascending, for the legend. */
export function markClassesOf(plan: Pick<Floorplan, "mark">): number[] {
  const seen = new Set<number>();
  for (let i = 0; i < plan.mark.length; i++) if (plan.mark[i] !== 0) seen.add(plan.mark[i]);
  return [...seen].sort((a, b) => a - b);
}
