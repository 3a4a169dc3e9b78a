"use client";

import { useEffect, useRef } from "react";
import type { FloorplanView } from "@/lib/protocol";
import { heatIndex, heatRgbaTable } from "../floor/heat-scale";

const TILE_PX = 18;
const ARROW: Record<string, string> = { N: "↑", E: "→", S: "↓", W: "←" };

export interface ReplayPose {
  row: number;
  col: number;
  heading: string;
}

/**
 * The floor as the system believed it at one replay step: blocked tiles, the belief heat
 * (one canvas pixel per tile, the live floor's colours), the estimate, the goal and, for
 * simulated robots, the true pose.
 */
export function ReplayFloor({ plan, masses, estimate, truth, goal }: { plan: FloorplanView; masses: Float32Array | null; estimate: ReplayPose | null; truth: ReplayPose | null; goal: { row: number; col: number } }) {
  const canvasRef = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    const ctx = canvasRef.current?.getContext("2d");
    if (!ctx) return;
    const image = ctx.createImageData(plan.cols, plan.rows);
    if (masses) {
      const rgba = heatRgbaTable();
      for (let i = 0; i < masses.length; i++) image.data.set(rgba.subarray(heatIndex(masses[i]) * 4, heatIndex(masses[i]) * 4 + 4), i * 4);
    }
    ctx.putImageData(image, 0, 0);
  }, [plan, masses]);
  const w = plan.cols * TILE_PX;
  const h = plan.rows * TILE_PX;
  const centre = (t: { row: number; col: number }) => ({ x: (t.col + 0.5) * TILE_PX, y: (t.row + 0.5) * TILE_PX });
  return (
    <div className="relative" style={{ width: w, height: h }} data-testid="replay-floor">
      <svg width={w} height={h} className="absolute inset-0" aria-hidden>
        {plan.blocked.map((b, i) =>
          b ? <rect key={i} x={(i % plan.cols) * TILE_PX} y={Math.floor(i / plan.cols) * TILE_PX} width={TILE_PX} height={TILE_PX} className="fill-ink-700" /> : null,
        )}
      </svg>
      <canvas ref={canvasRef} width={plan.cols} height={plan.rows} className="absolute inset-0" style={{ width: w, height: h, imageRendering: "pixelated" }} />
      <svg width={w} height={h} className="absolute inset-0">
        <rect x={goal.col * TILE_PX + 2} y={goal.row * TILE_PX + 2} width={TILE_PX - 4} height={TILE_PX - 4} className="fill-none stroke-tide" strokeWidth={2}>
          <title>Goal ({goal.row}, {goal.col})</title>
        </rect>
        {truth && (
          <g data-testid="replay-truth">
            <circle {...{ cx: centre(truth).x, cy: centre(truth).y }} r={TILE_PX / 2 - 1} className="fill-none stroke-amberline" strokeDasharray="3 2" strokeWidth={2} />
            <title>True pose ({truth.row}, {truth.col}) facing {truth.heading}</title>
          </g>
        )}
        {estimate && (
          <g data-testid="replay-estimate">
            <circle cx={centre(estimate).x} cy={centre(estimate).y} r={TILE_PX / 2 - 3} className="fill-ink-100" />
            <text x={centre(estimate).x} y={centre(estimate).y + 4} textAnchor="middle" className="fill-ink-950 text-[11px] font-bold">
              {ARROW[estimate.heading]}
            </text>
          </g>
        )}
      </svg>
    </div>
  );
}
