"use client";

import { forwardRef, useEffect, useImperativeHandle, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import type { Floorplan } from "@/lib/floorplan/types";
import { rectBounds, type Brush } from "./paint";
import { fitViewport, type Viewport } from "./viewport";

/** Mark classes 1, 2, 3, … cycle through these theme colours, as on the live floor. */
const MARK_TOKENS = ["--ink-300", "--amberline", "--tide", "--coral"];

interface Palette {
  free: string;
  blocked: string;
  grid: string;
  edge: string;
  dock: string;
  nogo: string;
  marks: string[];
  accent: string;
}

function readPalette(): Palette {
  const style = getComputedStyle(document.documentElement);
  const rgb = (token: string, alpha = 1) => `rgb(${style.getPropertyValue(token).trim().split(/\s+/).join(", ")}, ${alpha})`;
  return {
    free: rgb("--ink-900"),
    blocked: rgb("--ink-700"),
    grid: rgb("--ink-800"),
    edge: rgb("--ink-500"),
    dock: rgb("--tide", 0.8),
    nogo: rgb("--coral", 0.45),
    marks: MARK_TOKENS.map((t) => rgb(t, 0.85)),
    accent: rgb("--tide"),
  };
}

export interface TileCanvasHandle {
  canvas: HTMLCanvasElement | null;
}

interface Props {
  plan: Floorplan;
  /** Fixed view; omitted, the plan is fitted to the canvas. */
  view?: Viewport;
  /** Rectangle being dragged with the rectangle tool. */
  pendingRect?: { a: { row: number; col: number }; b: { row: number; col: number }; brush: Brush } | null;
  heightPx: number;
  label: string;
  cursor?: string;
  onSize?: (width: number, height: number) => void;
  onPointerDown?: (e: ReactPointerEvent<HTMLCanvasElement>) => void;
  onPointerMove?: (e: ReactPointerEvent<HTMLCanvasElement>) => void;
  onPointerUp?: (e: ReactPointerEvent<HTMLCanvasElement>) => void;
  /** Wheel over the canvas: zoom by `factor` about canvas point (x, y). */
  onWheelZoom?: (factor: number, x: number, y: number) => void;
}

/**
 * A floorplan drawn on a canvas, one fill per tile and layer, redrawn in one animation
 * frame when the plan, the view or the theme changes: a 200 × 200 plan is 40 000 rects,
 * a few milliseconds, where as SVG it would be 40 000 DOM nodes.
 */
export const TileCanvas = forwardRef<TileCanvasHandle, Props>(function TileCanvas(
  { plan, view, pendingRect, heightPx, label, cursor, onSize, onPointerDown, onPointerMove, onPointerUp, onWheelZoom },
  ref,
) {
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const [size, setSize] = useState({ width: 0, height: heightPx });
  const [themeTick, setThemeTick] = useState(0);
  useImperativeHandle(ref, () => ({ canvas: canvasRef.current }), []);
  const wheelRef = useRef(onWheelZoom);
  useEffect(() => {
    wheelRef.current = onWheelZoom;
  }, [onWheelZoom]);

  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    // React's wheel listener is passive; zooming must stop the page from scrolling too.
    const onWheel = (e: WheelEvent) => {
      if (!wheelRef.current) return;
      e.preventDefault();
      const box = canvas.getBoundingClientRect();
      wheelRef.current(Math.exp(-e.deltaY * 0.0015), e.clientX - box.left, e.clientY - box.top);
    };
    canvas.addEventListener("wheel", onWheel, { passive: false });
    return () => canvas.removeEventListener("wheel", onWheel);
  }, []);

  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    const observer = new ResizeObserver(() => {
      const width = canvas.clientWidth;
      setSize((old) => (old.width === width && old.height === heightPx ? old : { width, height: heightPx }));
      onSize?.(width, heightPx);
    });
    observer.observe(canvas);
    const themeWatch = new MutationObserver(() => setThemeTick((t) => t + 1));
    themeWatch.observe(document.documentElement, { attributes: true, attributeFilter: ["class"] });
    return () => {
      observer.disconnect();
      themeWatch.disconnect();
    };
  }, [heightPx, onSize]);

  useEffect(() => {
    const canvas = canvasRef.current;
    const ctx = canvas?.getContext("2d");
    if (!canvas || !ctx || size.width === 0) return;
    const frame = requestAnimationFrame(() => {
      // The bitmap must match the box the canvas has now, or the browser stretches the drawing.
      const width = canvas.clientWidth;
      const height = canvas.clientHeight;
      const dpr = window.devicePixelRatio || 1;
      canvas.width = Math.round(width * dpr);
      canvas.height = Math.round(height * dpr);
      ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
      const palette = readPalette();
      const v = view ?? fitViewport(plan.rows, plan.cols, width, height);
      const s = v.scale;
      ctx.clearRect(0, 0, width, height);
      ctx.fillStyle = palette.free;
      ctx.fillRect(v.offsetX, v.offsetY, plan.cols * s, plan.rows * s);
      const firstRow = Math.max(0, Math.floor(-v.offsetY / s));
      const lastRow = Math.min(plan.rows - 1, Math.floor((height - v.offsetY) / s));
      const firstCol = Math.max(0, Math.floor(-v.offsetX / s));
      const lastCol = Math.min(plan.cols - 1, Math.floor((width - v.offsetX) / s));
      for (let r = firstRow; r <= lastRow; r++) {
        const y = v.offsetY + r * s;
        for (let c = firstCol; c <= lastCol; c++) {
          const i = r * plan.cols + c;
          const x = v.offsetX + c * s;
          if (plan.blocked[i]) {
            ctx.fillStyle = palette.blocked;
            ctx.fillRect(x, y, s, s);
            continue;
          }
          if (plan.nogo[i]) {
            ctx.fillStyle = palette.nogo;
            ctx.fillRect(x, y, s, s);
          }
          if (plan.dock[i]) {
            ctx.strokeStyle = palette.dock;
            ctx.lineWidth = Math.max(1, s * 0.1);
            ctx.strokeRect(x + s * 0.15, y + s * 0.15, s * 0.7, s * 0.7);
          }
          if (plan.mark[i]) {
            ctx.fillStyle = palette.marks[(plan.mark[i] - 1) % palette.marks.length];
            ctx.beginPath();
            ctx.moveTo(x + s / 2, y + s * 0.25);
            ctx.lineTo(x + s * 0.75, y + s / 2);
            ctx.lineTo(x + s / 2, y + s * 0.75);
            ctx.lineTo(x + s * 0.25, y + s / 2);
            ctx.fill();
          }
        }
      }
      if (s >= 6) {
        ctx.strokeStyle = palette.grid;
        ctx.lineWidth = 1;
        ctx.beginPath();
        for (let r = firstRow; r <= lastRow + 1; r++) {
          const y = Math.round(v.offsetY + r * s) + 0.5;
          ctx.moveTo(v.offsetX + firstCol * s, y);
          ctx.lineTo(v.offsetX + (lastCol + 1) * s, y);
        }
        for (let c = firstCol; c <= lastCol + 1; c++) {
          const x = Math.round(v.offsetX + c * s) + 0.5;
          ctx.moveTo(x, v.offsetY + firstRow * s);
          ctx.lineTo(x, v.offsetY + (lastRow + 1) * s);
        }
        ctx.stroke();
      }
      ctx.strokeStyle = palette.edge;
      ctx.lineWidth = 1.5;
      ctx.strokeRect(v.offsetX, v.offsetY, plan.cols * s, plan.rows * s);
      if (pendingRect) {
        const { top, left, bottom, right } = rectBounds(plan, pendingRect.a, pendingRect.b);
        ctx.strokeStyle = palette.accent;
        ctx.setLineDash([4, 3]);
        ctx.lineWidth = 2;
        ctx.strokeRect(v.offsetX + left * s, v.offsetY + top * s, (right - left + 1) * s, (bottom - top + 1) * s);
        ctx.setLineDash([]);
      }
    });
    return () => cancelAnimationFrame(frame);
  }, [plan, view, pendingRect, size, themeTick]);

  return (
    <canvas
      ref={canvasRef}
      role="img"
      aria-label={label}
      className="block w-full touch-none rounded border border-ink-700 bg-ink-950"
      style={{ height: heightPx, cursor }}
      onPointerDown={onPointerDown}
      onPointerMove={onPointerMove}
      onPointerUp={onPointerUp}
      onPointerCancel={onPointerUp}
    />
  );
});
