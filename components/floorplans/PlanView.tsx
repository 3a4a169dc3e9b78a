"use client";

import { useMemo } from "react";
import type { FloorplanView } from "@/lib/protocol/ops-feed";
import { FloorLegend } from "@/components/floor/FloorTiles";
import { markClassesOf, planOfView } from "./convert";
import { TileCanvas } from "./TileCanvas";

/** A floorplan version drawn read-only, fitted to the width, with its legend. */
export function PlanView({ plan: view }: { plan: FloorplanView }) {
  const plan = useMemo(() => planOfView(view), [view]);
  return (
    <div className="space-y-2">
      <TileCanvas plan={plan} heightPx={520} label={`Floorplan ${view.name}, version ${view.version}, ${plan.rows} rows by ${plan.cols} columns`} />
      <FloorLegend markClasses={markClassesOf(plan)} />
    </div>
  );
}
