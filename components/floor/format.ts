/** Words and numbers of the live floor: state and hold labels, ages, percentages, sparklines. */
import type { AlertKind, HoldReason, RobotState } from "@/lib/vocabulary";

export const STATE_LABELS: Record<RobotState, string> = {
  idle: "Idle",
  under_way: "Under way",
  held: "Held",
  arrived: "Arrived",
  offline: "Offline",
};

export const HOLD_LABELS: Record<HoldReason, string> = {
  low_certainty: "low certainty",
  operator: "by an operator",
  offline: "link lost",
  traffic: "waiting for traffic",
  fault: "fault reported",
};

export const ALERT_LABELS: Record<AlertKind, string> = {
  low_certainty: "Low certainty",
  offline: "Offline",
  fault: "Fault",
  traffic: "Traffic wait",
  battery: "Battery",
  mission_failed: "Mission failed",
};

/** "Held · low certainty" style label for a robot's state and hold reason. */
export function stateLabel(state: RobotState, holdReason: HoldReason | null): string {
  if (state === "held" && holdReason) return `${STATE_LABELS.held} · ${HOLD_LABELS[holdReason]}`;
  return STATE_LABELS[state];
}

/** Age of a timestamp (ms since epoch) at `nowMs`, as "4 s", "3 min", "2 h", "5 d"; "—" for null; future times count as "0 s". */
export function formatAge(atMs: number | null, nowMs: number): string {
  if (atMs === null || !Number.isFinite(atMs)) return "—";
  const s = Math.max(0, Math.floor((nowMs - atMs) / 1000));
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min`;
  if (s < 86400) return `${Math.floor(s / 3600)} h`;
  return `${Math.floor(s / 86400)} d`;
}

/** A fraction in [0, 1] as a whole percentage ("73 %"); null or NaN as "—". */
export function formatPercent(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return "—";
  return `${Math.round(Math.min(1, Math.max(0, fraction)) * 100)} %`;
}

/** Local wall-clock time of a timestamp (ms) as HH:MM:SS. */
export function formatClock(atMs: number): string {
  const d = new Date(atMs);
  const two = (n: number) => String(n).padStart(2, "0");
  return `${two(d.getHours())}:${two(d.getMinutes())}:${two(d.getSeconds())}`;
}

/**
 * SVG path of a sparkline of values in [0, 1] across a width × height box, oldest at the
 * left; values are clamped, NaN dropped. Empty string for fewer than two values.
 */
export function sparklinePath(values: readonly number[], width: number, height: number): string {
  const clean = values.filter((v) => Number.isFinite(v)).map((v) => Math.min(1, Math.max(0, v)));
  if (clean.length < 2) return "";
  const dx = width / (clean.length - 1);
  return clean.map((v, i) => `${i === 0 ? "M" : "L"}${(i * dx).toFixed(2)},${((1 - v) * height).toFixed(2)}`).join(" ");
}
