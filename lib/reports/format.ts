/** Words and numbers of the shift summary, shared by the reports page and the e-mail digest. */
import type { HoldReason, MissionOutcome } from "../vocabulary";

export const OUTCOME_WORDS: Record<MissionOutcome | "active", string> = {
  reached: "Reached",
  aborted: "Aborted",
  failed: "Failed",
  active: "Under way",
};

export const HOLD_REASON_WORDS: Record<HoldReason, string> = {
  low_certainty: "Low certainty",
  operator: "Operator",
  offline: "Link lost",
  traffic: "Traffic",
  fault: "Fault",
};

/** A duration in seconds as "42 s", "3 min 20 s", "2 h 05 min"; null as "—". */
export function formatDurationS(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return "—";
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, "0")} s`;
  return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, "0")} min`;
}

/** A certainty in [0, 1] as a whole percentage ("63 %"); null as "—". */
export function formatCertainty(fraction: number | null): string {
  return fraction === null || !Number.isFinite(fraction) ? "—" : `${Math.round(fraction * 100)} %`;
}

/** An instant as "2026-03-01 06:00 UTC": digests and CSVs travel between time zones. */
export function formatInstantUtc(ms: number): string {
  return `${new Date(ms).toISOString().slice(0, 16).replace("T", " ")} UTC`;
}
