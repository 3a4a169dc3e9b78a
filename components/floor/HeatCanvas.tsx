"use client";

import { scaleLinear } from "@visx/scale";
import { useEffect, useRef } from "react";
import { beliefMasses, blendBeliefs, type BeliefView } from "./belief";
import { heatFillTable, heatIndex } from "./heat-scale";
import { useFloorStore, type FloorState } from "./store";

/**
 * The belief heat layer on a canvas. Belief frames never re-render React: the canvas
 * subscribes to the store and repaints at most once per animation frame, with tile
 * positions from visx linear scales and colours from the visx heat scale (precomputed).
 * A measured SVG <HeatmapRect> of 64×64 cells spent tens of ms per repaint; this path
 * stays near a millisecond (see the live floor report).
 */
export function HeatCanvas({ widthPx, heightPx }: { widthPx: number; heightPx: number }) {
  const store = useFloorStore();
  const canvasRef = useRef<HTMLCanvasElement>(null);

  useEffect(() => {
    const canvas = canvasRef.current;
    const ctx = canvas?.getContext("2d");
    if (!canvas || !ctx || widthPx <= 0 || heightPx <= 0) return;
    const dpr = window.devicePixelRatio || 1;
    canvas.width = Math.round(widthPx * dpr);
    canvas.height = Math.round(heightPx * dpr);
    const { rows, cols } = store.getState().floorplan;
    const x = scaleLinear<number>({ domain: [0, cols], range: [0, canvas.width] });
    const y = scaleLinear<number>({ domain: [0, rows], range: [0, canvas.height] });
    const fills = heatFillTable();
    const masses = new Float32Array(rows * cols);
    let frame = 0;

    const paint = () => {
      frame = 0;
      const s = store.getState();
      ctx.clearRect(0, 0, canvas.width, canvas.height);
      const views = layerBeliefs(s);
      if (views.length === 0) return;
      if (views.length === 1) beliefMasses(views[0], masses);
      else blendBeliefs(views, masses);
      // One pixel of overlap hides the seams between neighbouring tiles after rounding.
      const w = x(1) - x(0) + 1;
      const h = y(1) - y(0) + 1;
      for (let row = 0; row < rows; row++) {
        for (let col = 0; col < cols; col++) {
          const k = heatIndex(masses[row * cols + col]);
          if (k === 0) continue;
          ctx.fillStyle = fills[k];
          ctx.fillRect(Math.floor(x(col)), Math.floor(y(row)), Math.ceil(w), Math.ceil(h));
        }
      }
    };
    const schedule = () => {
      if (frame === 0) frame = requestAnimationFrame(paint);
    };
    schedule();
    const unsubscribe = store.subscribe((s, prev) => {
      if (s.beliefs !== prev.beliefs || s.selectedId !== prev.selectedId || s.heatMode !== prev.heatMode || s.robotIds !== prev.robotIds) schedule();
    });
    return () => {
      unsubscribe();
      if (frame !== 0) cancelAnimationFrame(frame);
    };
  }, [store, widthPx, heightPx]);

  return (
    <canvas
      ref={canvasRef}
      data-testid="belief-heat"
      aria-hidden
      className="pointer-events-none absolute inset-0"
      style={{ width: widthPx, height: heightPx }}
    />
  );
}

/** The beliefs the heat layer shows under the current mode. */
function layerBeliefs(s: FloorState): BeliefView[] {
  if (s.heatMode === "off") return [];
  if (s.heatMode === "selected") {
    const view = s.selectedId ? s.beliefs[s.selectedId] : undefined;
    return view ? [view] : [];
  }
  return s.robotIds.map((id) => s.beliefs[id]).filter((v): v is BeliefView => v !== undefined);
}
