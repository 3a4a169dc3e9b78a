/**
 * What the roster's routes answer and its pages show, shared by the server that builds
 * these and the components that draw them. None of them carries a key or a key hash.
 */
import type { RobotFrame } from "../protocol/ops-feed";
import type { SensorSpec } from "../sensing/model";
import type { Drive, MissionState, RobotState } from "../vocabulary";
import type { RobotSettings } from "./settings";

/** One robot of the roster; times in ms since the Unix epoch. */
export interface RosterEntry {
  id: string;
  name: string;
  drive: Drive;
  model: string;
  sensors: SensorSpec[];
  simulated: boolean;
  floorplanId: number | null;
  floorplanName: string | null;
  online: boolean;
  state: RobotState;
  lastSeenAt: number | null;
  retiredAt: number | null;
  createdAt: number;
}

export interface RobotMissionRow {
  id: number;
  goal: { row: number; col: number };
  state: MissionState;
  steps: number;
  holds: number;
  minCertainty: number | null;
  startedAt: number;
  endedAt: number | null;
}

/** Certainty (belief mass on the most likely tile) of one stored belief snapshot. */
export interface CertaintyPoint {
  at: number;
  tileMass: number;
}

/** A robot's page: its roster entry, its live frame (null when off the live floor), its missions and certainty. */
export interface RobotDetailView {
  robot: RosterEntry;
  frame: RobotFrame | null;
  missions: RobotMissionRow[];
  certainty: CertaintyPoint[];
}

/** The tuning a robot runs with, the defaults of its drive, and the sections that differ from them. */
export interface SettingsView {
  robotId: string;
  drive: Drive;
  settings: RobotSettings;
  defaults: RobotSettings;
  custom: (keyof RobotSettings)[];
}
