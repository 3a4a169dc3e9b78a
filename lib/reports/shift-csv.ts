/**
 * The shift summary as CSV: a header, one row per robot, then a totals row whose robot
 * id is empty. Figures are the summary's own numbers (seconds, certainty as 0–1), so a
 * spreadsheet sums and charts them without unit guessing. RFC 4180 quoting.
 */
import { HOLD_REASONS } from "../vocabulary";
import type { ShiftFigures, ShiftSummary } from "../protocol/reports";

export const SHIFT_CSV_COLUMNS = [
  "robot_id",
  "robot_name",
  "started",
  "reached",
  "aborted",
  "failed",
  "active",
  "under_way_s",
  "median_reach_s",
  "certainty_min",
  "certainty_mean",
  ...HOLD_REASONS.map((r) => `holds_${r}`),
] as const;

/** The robot name the totals row carries. */
export const TOTALS_LABEL = "All robots";

function cell(value: string | number | null): string {
  if (value === null) return "";
  const text = typeof value === "number" ? String(Math.round(value * 1000) / 1000) : value;
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function figureCells(f: ShiftFigures): (string | number | null)[] {
  return [f.started, f.reached, f.aborted, f.failed, f.active, f.underWayS, f.medianReachS, f.certaintyMin, f.certaintyMean, ...HOLD_REASONS.map((r) => f.holds[r])];
}

/** The summary as CSV text, CRLF line ends, numbers to three decimals. */
export function shiftSummaryCsv(summary: ShiftSummary): string {
  const rows = [
    [...SHIFT_CSV_COLUMNS],
    ...summary.robots.map((r) => [r.robotId, r.robotName, ...figureCells(r)]),
    ["", TOTALS_LABEL, ...figureCells(summary.totals)],
  ];
  return rows.map((row) => row.map(cell).join(",")).join("\r\n") + "\r\n";
}
