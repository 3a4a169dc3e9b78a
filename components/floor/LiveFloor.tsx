"use client";

import clsx from "clsx";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import type { LiveFloorSnapshot } from "@/lib/protocol/ops-feed";
import type { Role } from "@/lib/vocabulary";
import { roleAllows } from "@/lib/roles";
import { AlertsFeed } from "./AlertsFeed";
import { Kbd } from "./bits";
import { FloorCommandsContext, useFloorCommandSet } from "./commands";
import { ConfirmDialog } from "./ConfirmDialog";
import { FleetList } from "./FleetList";
import { FloorLegend } from "./FloorTiles";
import { FloorMap } from "./FloorMap";
import { HoverReadout } from "./HoverReadout";
import { useOpsSocket } from "./ops-socket";
import { useRestCommands } from "./use-rest-commands";
import { RobotCard } from "./RobotCard";
import { RobotTable } from "./RobotTable";
import { ShortcutHelp } from "./ShortcutHelp";
import { useFloorShortcuts } from "./shortcuts";
import { ConnectionBanner, ConnectionPill, NewerVersionBar, NoticeBar } from "./StatusBars";
import { createFloorStore, FloorStoreContext, useFloor, type HeatMode } from "./store";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";

const HEAT_CHOICES: { mode: HeatMode; label: string }[] = [
  { mode: "selected", label: "Selected" },
  { mode: "all", label: "All robots" },
  { mode: "off", label: "Off" },
];

function Segmented<T extends string>({ label, value, choices, onChange }: { label: string; value: T; choices: { mode: T; label: string }[]; onChange: (v: T) => void }) {
  return (
    <div role="radiogroup" aria-label={label} className="inline-flex rounded-md border border-ink-700 p-0.5">
      {choices.map((c) => (
        <button
          key={c.mode}
          type="button"
          role="radio"
          aria-checked={value === c.mode}
          onClick={() => onChange(c.mode)}
          className={clsx("rounded px-2 py-0.5 text-xs", value === c.mode ? "bg-ink-700 text-ink-100" : "text-ink-300 hover:text-ink-100")}
        >
          {c.label}
        </button>
      ))}
    </div>
  );
}

function Toolbar() {
  const router = useRouter();
  const plan = useFloor((s) => s.floorplan);
  const floorplans = useFloor((s) => s.floorplans);
  const heatMode = useFloor((s) => s.heatMode);
  const setHeatMode = useFloor((s) => s.setHeatMode);
  const setHelpOpen = useFloor((s) => s.setHelpOpen);
  return (
    <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
      <h1 className="sr-only">Live floor</h1>
      <label className="flex items-center gap-2 text-sm">
        <span className="text-ink-500">Floor</span>
        <select
          value={plan.id}
          onChange={(e) => router.push(`/floor?floorplan=${e.target.value}`)}
          className="rounded border border-ink-700 bg-ink-900 px-2 py-1 text-sm font-semibold"
          aria-label="Floorplan"
        >
          {floorplans.map((f) => (
            <option key={f.id} value={f.id}>
              {f.name}
            </option>
          ))}
        </select>
        <span className="font-mono text-xs text-ink-500">
          v{plan.version} · {plan.rows}×{plan.cols} · {plan.tileM} m tiles
        </span>
      </label>
      <span className="flex items-center gap-2 text-xs text-ink-500">
        Belief <Segmented label="Belief heat layer" value={heatMode} choices={HEAT_CHOICES} onChange={setHeatMode} />
        <Kbd>B</Kbd>
      </span>
      <span className="min-w-[16rem] flex-1 text-xs">
        <HoverReadout />
      </span>
      <ConnectionPill />
      <button type="button" onClick={() => setHelpOpen(true)} className="rounded-md border border-ink-700 px-2 py-0.5 text-xs text-ink-300 hover:text-ink-100" aria-keyshortcuts="?">
        Shortcuts <Kbd>?</Kbd>
      </button>
    </div>
  );
}

function FleetPanel() {
  const view = useFloor((s) => s.listView);
  const setView = useFloor((s) => s.setListView);
  const count = useFloor((s) => s.robotIds.length);
  const online = useFloor((s) => s.robotIds.filter((id) => s.robots[id]?.online).length);
  return (
    <section aria-label="Fleet" className="flex min-h-0 flex-col">
      <div className="mb-2 flex items-center justify-between gap-2">
        <h2 className="text-sm font-semibold text-ink-300">
          Fleet <span className="font-normal text-ink-500">{count > 0 ? `${online} of ${count} online` : ""}</span>
        </h2>
        <Segmented
          label="Fleet view"
          value={view}
          choices={[
            { mode: "cards", label: "Cards" },
            { mode: "table", label: "Table" },
          ]}
          onChange={setView}
        />
      </div>
      {count === 0 ? (
        <div data-testid="empty-fleet" className="rounded-md border border-dashed border-ink-700 p-4 text-sm text-ink-300">
          <p className="font-semibold text-ink-100">No robots on this floor yet.</p>
          <p className="mt-1 text-xs">Robots appear here as soon as they connect and report on this floorplan. Register them in Roster; the demo fleet starts with npm start.</p>
        </div>
      ) : (
        <div className="min-h-0 overflow-y-auto pr-1">{view === "cards" ? <FleetList /> : <RobotTable />}</div>
      )}
    </section>
  );
}

function markClassesOf(plan: LiveFloorSnapshot["floorplan"]): number[] {
  return [...new Set(plan.mark.filter((m) => m > 0))].sort((a, b) => a - b);
}

function Screen({ canCommand }: { canCommand: boolean }) {
  const listView = useFloor((s) => s.listView);
  const plan = useFloor((s) => s.floorplan);
  const markClasses = useMemo(() => markClassesOf(plan), [plan]);
  return (
    <div
      className={clsx(
        "grid h-[calc(100vh-3rem)] min-h-[36rem] gap-3 p-3",
        listView === "table" ? "grid-cols-[30rem_minmax(0,1fr)_22rem]" : "grid-cols-[17rem_minmax(0,1fr)_22rem]",
      )}
      data-can-command={canCommand}
    >
      <FleetPanel />
      <div className="flex min-h-0 flex-col gap-2">
        <Toolbar />
        <ConnectionBanner />
        <NewerVersionBar />
        <div className="min-h-0 flex-1 rounded-lg border border-ink-700 bg-ink-950 p-2">
          <FloorMap />
        </div>
        <FloorLegend markClasses={markClasses} />
      </div>
      <div className="flex min-h-0 flex-col gap-3">
        <NoticeBar />
        <RobotCard />
        <AlertsFeed />
      </div>
      <ConfirmDialog />
      <ShortcutHelp />
    </div>
  );
}

/**
 * The live floor for one floorplan: seeded from the server's snapshot, kept live over
 * /ops, commands sent to the HTTP routes. Operators and admins command robots; viewers watch.
 */
export function LiveFloor({ snapshot, role }: { snapshot: LiveFloorSnapshot; role: Role }) {
  const [queryClient] = useState(() => new QueryClient({ defaultOptions: { mutations: { retry: false } } }));
  return (
    <QueryClientProvider client={queryClient}>
      <LiveFloorScreen snapshot={snapshot} role={role} />
    </QueryClientProvider>
  );
}

function LiveFloorScreen({ snapshot, role }: { snapshot: LiveFloorSnapshot; role: Role }) {
  const [store] = useState(() => createFloorStore(snapshot));
  const canCommand = roleAllows(role, "operator");
  useOpsSocket(store);
  const send = useRestCommands();
  const commands = useFloorCommandSet(store, send, canCommand, roleAllows(role, "admin"));
  useFloorShortcuts(store, commands);
  return (
    <FloorStoreContext.Provider value={store}>
      <FloorCommandsContext.Provider value={commands}>
        <Screen canCommand={canCommand} />
      </FloorCommandsContext.Provider>
    </FloorStoreContext.Provider>
  );
}
