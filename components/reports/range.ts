/** The reports page's range: shortcuts, datetime-local values, and the API addresses of a range. */
import { SHIFT_MS } from "@/lib/protocol/reports";

export interface PickedRange {
  from: number;
  to: number;
  floorplanId: number | null;
}

export const RANGE_SHORTCUTS = [
  { label: "Last 8 h", ms: SHIFT_MS },
  { label: "Last 24 h", ms: 24 * 3600_000 },
  { label: "Last 7 days", ms: 7 * 86_400_000 },
] as const;

const pad = (n: number) => String(n).padStart(2, "0");

/** An instant as a datetime-local input's value, in the browser's time zone, to the minute. */
export function toLocalInput(ms: number): string {
  const d = new Date(ms);
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** A datetime-local value back to epoch ms; null when the field is empty or malformed. */
export function fromLocalInput(value: string): number | null {
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(value)) return null;
  const ms = new Date(value).getTime();
  return Number.isFinite(ms) ? ms : null;
}

/** The summary's query string for a range, optionally as CSV. */
export function shiftQueryString(range: PickedRange, format?: "csv"): string {
  const params = new URLSearchParams({ from: String(range.from), to: String(range.to) });
  if (range.floorplanId !== null) params.set("floorplan", String(range.floorplanId));
  if (format) params.set("format", format);
  return params.toString();
}
