"use client";

import clsx from "clsx";
import { useEffect, useState } from "react";
import type { RobotFrame } from "@/lib/protocol/ops-feed";
import { formatAge, formatPercent, sparklinePath, stateLabel } from "./format";

/** The current time in ms, refreshed every `everyMs`. */
export function useNow(everyMs = 1000): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNow(Date.now()), everyMs);
    return () => clearInterval(timer);
  }, [everyMs]);
  return now;
}

/** A ticking "12 s" age; amber past `staleS` seconds. */
export function Age({ at, staleS = 10 }: { at: number | null; staleS?: number }) {
  const now = useNow();
  const stale = at !== null && now - at > staleS * 1000;
  return (
    <time dateTime={at ? new Date(at).toISOString() : undefined} className={clsx("font-mono tabular-nums", stale && "text-amberline")}>
      {formatAge(at, now)}
    </time>
  );
}

/** Certainty history as a small line; the dashed line is the 50 % level. */
export function Sparkline({ values, width = 72, height = 18 }: { values: readonly number[]; width?: number; height?: number }) {
  const d = sparklinePath(values, width, height);
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} className="shrink-0 overflow-visible" aria-hidden>
      <line x1={0} x2={width} y1={height / 2} y2={height / 2} className="stroke-ink-700" strokeDasharray="2 2" strokeWidth={1} />
      {d && <path d={d} fill="none" className="stroke-tide" strokeWidth={1.5} strokeLinejoin="round" />}
    </svg>
  );
}

const STATE_TONES: Record<RobotFrame["state"], string> = {
  idle: "border-ink-500 text-ink-300",
  under_way: "border-tide/60 bg-tide/10 text-tide",
  held: "border-amberline/60 bg-amberline/10 text-amberline",
  arrived: "border-tide/40 text-tide",
  offline: "border-ink-700 bg-ink-800 text-ink-500",
};

/** The robot's state as a pill, with the hold reason when held; faults read coral. */
export function StatePill({ robot }: { robot: Pick<RobotFrame, "state" | "holdReason"> }) {
  const fault = robot.holdReason === "fault";
  return (
    <span
      data-testid="state-pill"
      className={clsx("inline-flex items-center whitespace-nowrap rounded border px-1.5 py-px text-xs font-medium", fault ? "border-coral/60 bg-coral/10 text-coral" : STATE_TONES[robot.state])}
    >
      {stateLabel(robot.state, robot.holdReason)}
    </span>
  );
}

/** Certainty as a number and a bar; amber under 35 %. */
export function Certainty({ value }: { value: number | null }) {
  const v = value ?? 0;
  return (
    <span className="inline-flex items-center gap-1.5">
      <span className="relative inline-block h-1.5 w-12 overflow-hidden rounded-full bg-ink-700" aria-hidden>
        <span className={clsx("absolute inset-y-0 left-0 rounded-full", v < 0.35 ? "bg-amberline" : "bg-tide")} style={{ width: `${Math.round(Math.min(1, Math.max(0, v)) * 100)}%` }} />
      </span>
      <span className="whitespace-nowrap font-mono text-xs tabular-nums">{formatPercent(value)}</span>
    </span>
  );
}

/** Battery as a percentage; coral under 20 %. */
export function Battery({ value }: { value: number | null }) {
  return <span className={clsx("whitespace-nowrap font-mono text-xs tabular-nums", value !== null && value < 0.2 && "text-coral")}>{formatPercent(value)}</span>;
}

/** A small key cap for shortcut hints. */
export function Kbd({ children }: { children: string }) {
  return <kbd className="rounded border border-ink-700 bg-ink-800 px-1 font-mono text-[0.7rem] text-ink-300">{children}</kbd>;
}
