"use client";

import { QueryClient, QueryClientProvider, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import type { RobotDetailView, SettingsView } from "@/lib/roster";
import { Age, Battery, Certainty, StatePill } from "@/components/floor/bits";
import { CertaintyChart } from "./CertaintyChart";
import { SettingsForm } from "./SettingsForm";

const OUTCOME_LABEL: Record<string, string> = { active: "Under way", reached: "Reached", aborted: "Aborted", failed: "Failed" };
/** How often the page asks for the robot's live state, ms. */
const REFRESH_MS = 3000;

function when(ms: number): string {
  return new Date(ms).toISOString().replace("T", " ").slice(0, 19);
}

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="flex flex-col gap-0.5">
      <dt className="text-xs text-ink-500">{label}</dt>
      <dd className="text-sm">{children}</dd>
    </div>
  );
}

interface Props {
  initial: RobotDetailView;
  settings: SettingsView;
  canEdit: boolean;
  levels: { holdBelow: number; releaseAbove: number };
}

function RobotView({ initial, settings, canEdit, levels }: Props) {
  const id = initial.robot.id;
  const { data } = useQuery({
    queryKey: ["robot", id],
    queryFn: async (): Promise<RobotDetailView> => {
      const res = await fetch(`/api/robots/${encodeURIComponent(id)}`);
      if (!res.ok) throw new Error(`the server answered ${res.status}`);
      return (await res.json()) as RobotDetailView;
    },
    initialData: initial,
    refetchInterval: REFRESH_MS,
  });
  const { robot, frame, missions, certainty } = data;
  const estimate = frame?.estimate ?? null;
  return (
    <section className="mx-auto max-w-6xl space-y-6 p-6">
      <div className="flex flex-wrap items-baseline gap-3">
        <Link href="/roster" className="text-sm text-ink-500 hover:text-ink-100">
          ← Roster
        </Link>
        <h1 className="text-xl font-semibold">{robot.name}</h1>
        <span className="font-mono text-xs text-ink-500">{robot.id}</span>
        {robot.retiredAt !== null && <span className="rounded border border-coral/60 px-1.5 text-xs text-coral">Retired {when(robot.retiredAt)} UTC</span>}
      </div>

      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.3fr)]">
        <section aria-labelledby="robot-state-title" className="space-y-3 rounded-md border border-ink-700 bg-ink-900 p-4">
          <h2 id="robot-state-title" className="text-sm font-semibold">
            Current state
          </h2>
          <dl className="grid grid-cols-2 gap-3" data-testid="robot-state">
            <Fact label="State">{frame ? <StatePill robot={frame} /> : <span className="text-ink-500">Off the live floor</span>}</Fact>
            <Fact label="Link">{robot.online ? "Online" : "Offline: no recent heartbeat"}</Fact>
            <Fact label="Most likely pose">{estimate ? <span className="font-mono">({estimate.row}, {estimate.col}) {estimate.heading}</span> : "—"}</Fact>
            <Fact label="Certainty">
              <Certainty value={estimate?.tileMass ?? null} />
            </Fact>
            <Fact label="Battery">
              <Battery value={frame?.battery ?? null} />
            </Fact>
            <Fact label="Last message">{frame?.lastMessageAt ? <Age at={frame.lastMessageAt} /> : "—"}</Fact>
            <Fact label="Mission">
              {frame?.mission ? (
                <Link href={`/logbook/${frame.mission.id}`} className="text-tide underline underline-offset-2">
                  #{frame.mission.id} to ({frame.mission.goal.row}, {frame.mission.goal.col}), step {frame.mission.step}
                </Link>
              ) : (
                "None"
              )}
            </Fact>
            <Fact label="Drive">{robot.drive === "bicycle" ? "Bicycle" : "Differential"}</Fact>
            <Fact label="Kind">{robot.simulated ? "Simulated" : "Hardware"}</Fact>
            <Fact label="Floorplan">{robot.floorplanName ?? "Default"}</Fact>
          </dl>
          <div>
            <h3 className="text-xs text-ink-500">Sensors</h3>
            <ul className="mt-1 space-y-0.5 font-mono text-xs">
              {robot.sensors.map((s) => (
                <li key={s.id}>
                  {s.id}: {s.kind === "range" ? `range, bearing ${s.bearingDeg}°, up to ${s.maxRangeM} m` : "floor marks"}
                </li>
              ))}
            </ul>
          </div>
        </section>

        <section aria-labelledby="robot-certainty-title" className="space-y-2 rounded-md border border-ink-700 bg-ink-900 p-4">
          <h2 id="robot-certainty-title" className="text-sm font-semibold">
            Recent certainty
          </h2>
          <CertaintyChart points={certainty} holdBelow={levels.holdBelow} releaseAbove={levels.releaseAbove} />
        </section>
      </div>

      <section aria-labelledby="robot-missions-title" className="space-y-2">
        <h2 id="robot-missions-title" className="text-sm font-semibold">
          Missions
        </h2>
        {missions.length === 0 ? (
          <p className="rounded border border-dashed border-ink-700 p-4 text-sm text-ink-500">No missions yet.</p>
        ) : (
          <table className="w-full text-sm" aria-label="Missions of this robot">
            <thead className="text-left text-xs text-ink-500">
              <tr>
                <th className="py-1 font-medium">Mission</th>
                <th className="font-medium">Goal</th>
                <th className="font-medium">Started (UTC)</th>
                <th className="font-medium">Outcome</th>
                <th className="font-medium">Steps</th>
                <th className="font-medium">Holds</th>
                <th className="font-medium">Lowest certainty</th>
              </tr>
            </thead>
            <tbody>
              {missions.map((m) => (
                <tr key={m.id} className="border-t border-ink-800">
                  <td className="py-1">
                    <Link href={`/logbook/${m.id}`} className="text-tide underline underline-offset-2">
                      #{m.id}
                    </Link>
                  </td>
                  <td className="font-mono">
                    ({m.goal.row}, {m.goal.col})
                  </td>
                  <td className="font-mono">{when(m.startedAt)}</td>
                  <td>{OUTCOME_LABEL[m.state]}</td>
                  <td className="font-mono">{m.steps}</td>
                  <td className="font-mono">{m.holds}</td>
                  <td className="font-mono">{m.minCertainty === null ? "—" : `${Math.round(m.minCertainty * 100)} %`}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section aria-labelledby="robot-settings-title" className="space-y-2">
        <h2 id="robot-settings-title" className="text-sm font-semibold">
          Models and gains
        </h2>
        {robot.retiredAt === null ? (
          <SettingsForm view={settings} canEdit={canEdit} online={robot.online} />
        ) : (
          <p className="text-sm text-ink-500">A retired robot keeps its last settings; they can no longer be changed.</p>
        )}
      </section>
    </section>
  );
}

/** A robot's page: its live state (refreshed every few seconds), recent certainty, missions, and tuning. */
export function RobotPage(props: Props) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { retry: false } } }));
  return (
    <QueryClientProvider client={client}>
      <RobotView {...props} />
    </QueryClientProvider>
  );
}
