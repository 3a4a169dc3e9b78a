/**
 * The simulator CLI's text surfaces, kept apart from its I/O so that they can be tested:
 * the fleet file (JSON `{ robots: SimRobotSpec[] }`, as the server's seed writes it), the
 * fault commands typed on stdin, and the one-line-per-event log format (logfmt-style
 * key=value pairs after the time, robot and event kind).
 */
import { SensorSchema } from "../lib/protocol";
import type { Sensor } from "../lib/sensing";
import { DRIVES, HEADINGS, type Drive, type Heading } from "../lib/vocabulary";
import type { SimEvent, SimFault, SimRobotSpec } from "./sim-robot";

export type FleetFileResult = { ok: true; robots: SimRobotSpec[] } | { ok: false; reason: string };

const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === "object" && value !== null && !Array.isArray(value);
const isTileIndex = (value: unknown): value is number => Number.isInteger(value) && (value as number) >= 0;

/** Reads a fleet file's text; the reason names the first robot and field that is wrong. */
export function parseFleetFile(text: string): FleetFileResult {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    return { ok: false, reason: `not JSON: ${(err as Error).message}` };
  }
  if (!isRecord(json) || !Array.isArray(json.robots)) return { ok: false, reason: "expected an object with a robots array" };
  const robots: SimRobotSpec[] = [];
  for (const [index, raw] of json.robots.entries()) {
    const where = `robots[${index}]`;
    if (!isRecord(raw)) return { ok: false, reason: `${where}: not an object` };
    const { id, key, name, drive, sensors, start } = raw;
    if (typeof id !== "string" || id.length === 0) return { ok: false, reason: `${where}.id: expected a non-empty string` };
    if (typeof key !== "string" || key.length === 0) return { ok: false, reason: `${where}.key: expected a non-empty string` };
    if (name !== undefined && typeof name !== "string") return { ok: false, reason: `${where}.name: expected a string` };
    if (!DRIVES.includes(drive as Drive)) return { ok: false, reason: `${where}.drive: expected one of ${DRIVES.join(", ")}` };
    if (!Array.isArray(sensors)) return { ok: false, reason: `${where}.sensors: expected an array` };
    const parsedSensors: Sensor[] = [];
    for (const [k, sensor] of sensors.entries()) {
      const parsed = SensorSchema.safeParse(sensor);
      if (!parsed.success) return { ok: false, reason: `${where}.sensors[${k}]: ${parsed.error.issues[0]?.message ?? "invalid"}` };
      parsedSensors.push(parsed.data);
    }
    if (!isRecord(start) || !isTileIndex(start.row) || !isTileIndex(start.col) || !HEADINGS.includes(start.heading as Heading)) {
      return { ok: false, reason: `${where}.start: expected { row, col, heading } with heading one of ${HEADINGS.join(", ")}` };
    }
    robots.push({ id, key, name: name ?? id, drive: drive as Drive, sensors: parsedSensors, start: { row: start.row, col: start.col, heading: start.heading as Heading } });
  }
  return { ok: true, robots };
}

export type CliCommand = { kind: "fault"; robot: string; fault: SimFault } | { kind: "help" } | { kind: "status" } | { kind: "quit" } | { kind: "empty" } | { kind: "error"; reason: string };

export const COMMAND_HELP = [
  "kidnap <robotId> <row> <col> [heading]   carry the robot to a tile (heading N/E/S/W, default: as it faces)",
  "stall <robotId> <seconds> [left|right]   jam a wheel for simulated seconds (default left)",
  "drop <robotId> <seconds>                 cut the robot's link for simulated seconds",
  "drain <robotId>                          drain the battery to 5 %",
  "status                                   print every robot's true tile, battery and link",
  "help                                     this list",
  "quit                                     stop the fleet",
].join("\n");

const positive = (text: string | undefined) => {
  const value = Number(text);
  return text !== undefined && Number.isFinite(value) && value > 0 ? value : null;
};

/** Parses one line typed on stdin. */
export function parseCommand(line: string): CliCommand {
  const words = line.trim().split(/\s+/).filter(Boolean);
  if (words.length === 0) return { kind: "empty" };
  const [verb, robot, ...rest] = words;
  switch (verb.toLowerCase()) {
    case "help":
    case "?":
      return { kind: "help" };
    case "status":
      return { kind: "status" };
    case "quit":
    case "exit":
      return { kind: "quit" };
    case "kidnap": {
      const [rowText, colText, headingText] = rest;
      const row = Number(rowText);
      const col = Number(colText);
      if (!robot || !Number.isInteger(row) || !Number.isInteger(col) || row < 0 || col < 0) return { kind: "error", reason: "usage: kidnap <robotId> <row> <col> [heading]" };
      const heading = headingText?.toUpperCase();
      if (heading !== undefined && !HEADINGS.includes(heading as Heading)) return { kind: "error", reason: `heading must be one of ${HEADINGS.join(", ")}` };
      return { kind: "fault", robot, fault: { kind: "kidnap", row, col, ...(heading ? { heading: heading as Heading } : {}) } };
    }
    case "stall": {
      const seconds = positive(rest[0]);
      const wheel = rest[1]?.toLowerCase();
      if (!robot || seconds === null || (wheel !== undefined && wheel !== "left" && wheel !== "right")) return { kind: "error", reason: "usage: stall <robotId> <seconds> [left|right]" };
      return { kind: "fault", robot, fault: { kind: "stall", seconds, ...(wheel ? { wheel: wheel as "left" | "right" } : {}) } };
    }
    case "drop": {
      const seconds = positive(rest[0]);
      if (!robot || seconds === null) return { kind: "error", reason: "usage: drop <robotId> <seconds>" };
      return { kind: "fault", robot, fault: { kind: "drop", seconds } };
    }
    case "drain":
      if (!robot) return { kind: "error", reason: "usage: drain <robotId>" };
      return { kind: "fault", robot, fault: { kind: "drain" } };
    default:
      return { kind: "error", reason: `unknown command "${verb}" (type help)` };
  }
}

function formatValue(value: unknown): string {
  if (typeof value === "string") return /^[\w.:/-]+$/.test(value) ? value : JSON.stringify(value);
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  return JSON.stringify(value);
}

/** One log line: wall time (UTC), robot, event kind, simulated time, then the event's fields as key=value. */
export function formatEvent(event: SimEvent, wallMs: number): string {
  const fields = Object.entries(event.detail)
    .filter(([, value]) => value !== undefined)
    .map(([key, value]) => `${key}=${formatValue(value)}`);
  return [new Date(wallMs).toISOString().slice(11, 23), event.robot, event.kind, `simS=${event.timeS}`, ...fields].join(" ");
}
