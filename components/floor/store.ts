/**
 * The live floor's client state: one zustand store per page, fed by the /ops socket.
 * Robots are kept by id so that a robot frame replaces one entry and re-renders only the
 * components that select that robot; belief frames are kept apart and drawn by the heat
 * canvas outside React.
 */
"use client";

import { createContext, useContext } from "react";
import { useStore } from "zustand";
import { createStore, type StoreApi } from "zustand/vanilla";
import type { AlertFrame, FloorplanVersionFrame, FloorplanView, LiveFloorSnapshot, RobotFrame } from "@/lib/protocol/ops-feed";
import type { Heading } from "@/lib/vocabulary";
import type { BeliefView } from "./belief";
import type { TileCoord } from "./geometry";

export type Connection = "connecting" | "live" | "reconnecting" | "refused";
export type HeatMode = "selected" | "all" | "off";
export type ListView = "cards" | "table";

/** What a click on the map does next. */
export type PickMode = { kind: "dispatch" } | { kind: "relocate"; tile: TileCoord | null; heading: Heading | null };

/** A command waiting for confirmation in the dialog. */
export type PendingConfirm =
  | { kind: "dispatch"; robotId: string; goal: TileCoord }
  | { kind: "release"; robotId: string }
  | { kind: "relocate"; robotId: string; tile: TileCoord; heading: Heading | null };

export interface Notice {
  tone: "error" | "info";
  text: string;
  at: number;
}

export interface FloorState {
  floorplan: FloorplanView;
  floorplans: { id: number; name: string }[];
  robots: Record<string, RobotFrame>;
  robotIds: string[];
  beliefs: Record<string, BeliefView>;
  alerts: AlertFrame[];
  /** Goals sent but not yet seen in a robot frame, so a mission shows at once. */
  pendingGoals: Record<string, TileCoord>;
  selectedId: string | null;
  heatMode: HeatMode;
  listView: ListView;
  pick: PickMode;
  confirm: PendingConfirm | null;
  hover: TileCoord | null;
  connection: Connection;
  connectionDetail: string | null;
  notice: Notice | null;
  helpOpen: boolean;
  /** A version of this floorplan saved after the page was rendered. */
  newerVersion: { versionId: number; version: number } | null;
}

export interface FloorActions {
  /** Replaces the robots (and the alerts, when given) after a (re)connect. */
  applySnapshot(snapshot: { robots: RobotFrame[]; alerts?: AlertFrame[] }): void;
  upsertRobot(frame: RobotFrame): void;
  removeRobot(robotId: string): void;
  putBelief(view: BeliefView): void;
  upsertAlert(alert: AlertFrame): void;
  select(robotId: string | null): void;
  selectStep(delta: 1 | -1): void;
  setHeatMode(mode: HeatMode): void;
  setListView(view: ListView): void;
  setPick(pick: PickMode): void;
  setConfirm(confirm: PendingConfirm | null): void;
  setHover(tile: TileCoord | null): void;
  setConnection(connection: Connection, detail?: string | null): void;
  setPendingGoal(robotId: string, goal: TileCoord | null): void;
  notify(tone: Notice["tone"], text: string): void;
  clearNotice(): void;
  setHelpOpen(open: boolean): void;
  noteVersion(frame: FloorplanVersionFrame): void;
}

export type FloorStore = StoreApi<FloorState & FloorActions>;

function byName(robots: Record<string, RobotFrame>): string[] {
  return Object.values(robots)
    .sort((a, b) => a.name.localeCompare(b.name, undefined, { numeric: true }) || a.robotId.localeCompare(b.robotId))
    .map((r) => r.robotId);
}

function sameIds(a: string[], b: string[]): boolean {
  return a.length === b.length && a.every((id, i) => id === b[i]);
}

function alertsNewestFirst(alerts: AlertFrame[]): AlertFrame[] {
  return [...alerts].sort((a, b) => b.createdAt - a.createdAt || b.id - a.id);
}

/** Most alerts kept in the feed; older ones live in the logbook. */
const ALERTS_KEPT = 200;

/** A store seeded from the server-rendered snapshot; robots on other floorplans are left out. */
export function createFloorStore(snapshot: LiveFloorSnapshot): FloorStore {
  const robots: Record<string, RobotFrame> = {};
  for (const r of snapshot.robots) if (r.floorplanId === null || r.floorplanId === snapshot.floorplan.id) robots[r.robotId] = r;
  const robotIds = byName(robots);
  return createStore<FloorState & FloorActions>()((set, get) => ({
    floorplan: snapshot.floorplan,
    floorplans: snapshot.floorplans,
    robots,
    robotIds,
    beliefs: {},
    alerts: alertsNewestFirst(snapshot.alerts).slice(0, ALERTS_KEPT),
    pendingGoals: {},
    selectedId: robotIds[0] ?? null,
    heatMode: "selected",
    listView: "cards",
    pick: { kind: "dispatch" },
    confirm: null,
    hover: null,
    connection: "connecting",
    connectionDetail: null,
    notice: null,
    helpOpen: false,
    newerVersion: null,

    applySnapshot(next) {
      const fresh: Record<string, RobotFrame> = {};
      for (const r of next.robots) if (r.floorplanId === null || r.floorplanId === get().floorplan.id) fresh[r.robotId] = r;
      const ids = byName(fresh);
      const selectedId = get().selectedId;
      set({
        robots: fresh,
        robotIds: ids,
        alerts: next.alerts ? alertsNewestFirst(next.alerts).slice(0, ALERTS_KEPT) : get().alerts,
        selectedId: selectedId && fresh[selectedId] ? selectedId : (ids[0] ?? null),
      });
    },
    upsertRobot(frame) {
      const s = get();
      if (frame.floorplanId !== null && frame.floorplanId !== s.floorplan.id) {
        if (s.robots[frame.robotId]) s.removeRobot(frame.robotId);
        return;
      }
      const robots = { ...s.robots, [frame.robotId]: frame };
      const prev = s.robots[frame.robotId];
      const ids = prev && prev.name === frame.name ? s.robotIds : byName(robots);
      const pending = s.pendingGoals[frame.robotId];
      const pendingGoals =
        pending && frame.mission && frame.mission.goal.row === pending.row && frame.mission.goal.col === pending.col
          ? Object.fromEntries(Object.entries(s.pendingGoals).filter(([id]) => id !== frame.robotId))
          : s.pendingGoals;
      set({
        robots,
        robotIds: sameIds(ids, s.robotIds) ? s.robotIds : ids,
        pendingGoals,
        selectedId: s.selectedId ?? frame.robotId,
      });
    },
    removeRobot(robotId) {
      const s = get();
      if (!s.robots[robotId]) return;
      const robots = { ...s.robots };
      delete robots[robotId];
      const beliefs = { ...s.beliefs };
      delete beliefs[robotId];
      const robotIds = s.robotIds.filter((id) => id !== robotId);
      set({ robots, beliefs, robotIds, selectedId: s.selectedId === robotId ? (robotIds[0] ?? null) : s.selectedId });
    },
    putBelief(view) {
      set({ beliefs: { ...get().beliefs, [view.robotId]: view } });
    },
    upsertAlert(alert) {
      const rest = get().alerts.filter((a) => a.id !== alert.id);
      set({ alerts: alertsNewestFirst([alert, ...rest]).slice(0, ALERTS_KEPT) });
    },
    select(robotId) {
      set({ selectedId: robotId, pick: { kind: "dispatch" } });
    },
    selectStep(delta) {
      const { robotIds, selectedId } = get();
      if (robotIds.length === 0) return;
      const at = selectedId ? robotIds.indexOf(selectedId) : -1;
      const next = at < 0 ? (delta > 0 ? 0 : robotIds.length - 1) : (at + delta + robotIds.length) % robotIds.length;
      set({ selectedId: robotIds[next], pick: { kind: "dispatch" } });
    },
    setHeatMode(heatMode) {
      set({ heatMode });
    },
    setListView(listView) {
      set({ listView });
    },
    setPick(pick) {
      set({ pick });
    },
    setConfirm(confirm) {
      set({ confirm });
    },
    setHover(hover) {
      const prev = get().hover;
      if (prev === hover || (prev && hover && prev.row === hover.row && prev.col === hover.col)) return;
      set({ hover });
    },
    setConnection(connection, detail = null) {
      set({ connection, connectionDetail: detail });
    },
    setPendingGoal(robotId, goal) {
      const rest = Object.fromEntries(Object.entries(get().pendingGoals).filter(([id]) => id !== robotId));
      set({ pendingGoals: goal ? { ...rest, [robotId]: goal } : rest });
    },
    notify(tone, text) {
      set({ notice: { tone, text, at: Date.now() } });
    },
    clearNotice() {
      set({ notice: null });
    },
    setHelpOpen(helpOpen) {
      set({ helpOpen });
    },
    noteVersion({ floorplanId, versionId, version }) {
      const { floorplan } = get();
      if (floorplanId === floorplan.id && version > floorplan.version) set({ newerVersion: { versionId, version } });
    },
  }));
}

export const FloorStoreContext = createContext<FloorStore | null>(null);

/** The page's floor store; throws outside <LiveFloor>, which is a programmer error. */
export function useFloorStore(): FloorStore {
  const store = useContext(FloorStoreContext);
  if (!store) throw new Error("useFloor must be used inside <LiveFloor>");
  return store;
}

/** Selects a slice of the floor state; the component re-renders only when the slice changes (Object.is). */
export function useFloor<T>(selector: (state: FloorState & FloorActions) => T): T {
  return useStore(useFloorStore(), selector);
}
