"use client";

import { useEffect, useRef } from "react";
import { beliefMasses, blendBeliefs, type BeliefView } from "./belief";
import { heatIndex, heatRgbaTable } from "./heat-scale";
import { useFloorStore, type FloorState } from "./store";

/**
 * The belief heat layer: a canvas of one pixel per tile, scaled up by CSS with
 * `image-rendering: pixelated`, so the compositor does the enlarging and a repaint
 * touches rows × cols pixels only. Colours come from the visx mass axis and ramp
 * (heat-scale.ts), precomputed as RGBA bytes. Belief frames never re-render React:
 * the canvas subscribes to the store and repaints at most every MIN_REPAINT_MS.
 * Chosen by measurement (headless chromium, 64 × 64 plan, 10 robots at 5 Hz, all
 * robots blended): an SVG <HeatmapRect> repaint took about 45 ms and gave tasks up
 * to 218 ms; this canvas repaint takes under 1 ms and no task passed 35 ms.
 */
/**
 * Least time between two repaints, in ms. Ten robots at 5 Hz would otherwise repaint on
 * nearly every animation frame; a belief shown at 10 Hz reads the same to an operator.
 */
const MIN_REPAINT_MS = 100;

export function HeatCanvas({ widthPx, heightPx }: { widthPx: number; heightPx: number }) {
  const store = useFloorStore();
  const canvasRef = useRef<HTMLCanvasElement>(null);

  useEffect(() => {
    const canvas = canvasRef.current;
    const ctx = canvas?.getContext("2d");
    if (!canvas || !ctx) return;
    const { rows, cols } = store.getState().floorplan;
    canvas.width = cols;
    canvas.height = rows;
    const rgba = heatRgbaTable();
    const image = ctx.createImageData(cols, rows);
    const pixels = image.data;
    const masses = new Float32Array(rows * cols);
    let frame = 0;
    let timer: ReturnType<typeof setTimeout> | undefined;
    let paintedAt = -Infinity;

    const paint = () => {
      frame = 0;
      paintedAt = performance.now();
      const views = layerBeliefs(store.getState());
      if (views.length === 0) {
        ctx.clearRect(0, 0, cols, rows);
        return;
      }
      if (views.length === 1) beliefMasses(views[0], masses);
      else blendBeliefs(views, masses);
      for (let i = 0; i < masses.length; i++) {
        const k = heatIndex(masses[i]) * 4;
        pixels[i * 4] = rgba[k];
        pixels[i * 4 + 1] = rgba[k + 1];
        pixels[i * 4 + 2] = rgba[k + 2];
        pixels[i * 4 + 3] = rgba[k + 3];
      }
      ctx.putImageData(image, 0, 0);
    };
    const schedule = () => {
      if (frame !== 0 || timer !== undefined) return;
      const wait = paintedAt + MIN_REPAINT_MS - performance.now();
      if (wait <= 0) frame = requestAnimationFrame(paint);
      else
        timer = setTimeout(() => {
          timer = undefined;
          frame = requestAnimationFrame(paint);
        }, wait);
    };
    schedule();
    const unsubscribe = store.subscribe((s, prev) => {
      if (s.heatMode !== prev.heatMode || s.selectedId !== prev.selectedId || s.robotIds !== prev.robotIds) schedule();
      else if (s.beliefs === prev.beliefs || s.heatMode === "off") return;
      else if (s.heatMode === "all" || (s.selectedId && s.beliefs[s.selectedId] !== prev.beliefs[s.selectedId])) schedule();
    });
    return () => {
      unsubscribe();
      if (frame !== 0) cancelAnimationFrame(frame);
      clearTimeout(timer);
    };
  }, [store]);

  return (
    <canvas
      ref={canvasRef}
      data-testid="belief-heat"
      aria-hidden
      className="pointer-events-none absolute inset-0 will-change-transform"
      style={{ width: widthPx, height: heightPx, imageRendering: "pixelated" }}
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
