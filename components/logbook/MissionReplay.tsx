"use client";

import { QueryClient, QueryClientProvider, keepPreviousData, useQuery } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import type { FloorplanView } from "@/lib/protocol";
import { ReplayFloor, type ReplayPose } from "./ReplayFloor";

interface ReplayAnswer {
  step: number;
  steps: number;
  event: { kind: string; payload: Record<string, unknown> } | null;
  estimate: ReplayPose & { tileMass: number; entropy: number };
  truth: ReplayPose | null;
  errorTiles: number | null;
  belief: { scale: number; data: string };
}

async function fetchReplay(missionId: number, step: number): Promise<ReplayAnswer> {
  const res = await fetch(`/api/missions/${missionId}/replay?step=${step}`, { credentials: "same-origin" });
  const body = await res.json();
  if (!res.ok) throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
  return body as ReplayAnswer;
}

function masses(belief: ReplayAnswer["belief"]): Float32Array {
  const bytes = Uint8Array.from(atob(belief.data), (c) => c.charCodeAt(0));
  const out = new Float32Array(bytes.length);
  for (let i = 0; i < bytes.length; i++) out[i] = (bytes[i] / 255) * belief.scale;
  return out;
}

function describe(event: ReplayAnswer["event"]): string {
  if (!event) return "Start of the mission";
  if (event.kind === "moved") return `Moved: ${String(event.payload.action)}`;
  if (event.kind === "sensed") return `Sensed ${(event.payload.readings as unknown[]).length} readings`;
  return `Pose hint: tile (${String(event.payload.row)}, ${String(event.payload.col)})`;
}

const SPEEDS = [1, 2, 5, 10];

function Replay({ missionId, steps, plan, goal }: { missionId: number; steps: number; plan: FloorplanView; goal: { row: number; col: number } }) {
  const [step, setStep] = useState(steps);
  const [playing, setPlaying] = useState(false);
  const [speed, setSpeed] = useState(2);
  const query = useQuery({ queryKey: ["replay", missionId, step], queryFn: () => fetchReplay(missionId, step), placeholderData: keepPreviousData, staleTime: Infinity });
  useEffect(() => {
    if (!playing) return;
    const timer = setInterval(() => setStep((s) => (s >= steps ? s : s + 1)), 1000 / speed);
    return () => clearInterval(timer);
  }, [playing, speed, steps]);
  useEffect(() => {
    if (step >= steps) setPlaying(false);
  }, [step, steps]);
  const data = query.data;
  const heat = useMemo(() => (data ? masses(data.belief) : null), [data]);
  return (
    <section className="space-y-3" aria-label="Replay">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <button type="button" className="rounded-md border border-ink-700 px-2.5 py-1" onClick={() => (step >= steps ? (setStep(0), setPlaying(true)) : setPlaying(!playing))}>
          {playing ? "Pause" : "Play"}
        </button>
        <input
          type="range"
          min={0}
          max={steps}
          value={step}
          aria-label="Replay step"
          className="w-72 accent-teal-400"
          onChange={(e) => {
            setPlaying(false);
            setStep(Number(e.target.value));
          }}
        />
        <span className="font-mono" data-testid="replay-step">
          update {step} / {steps}
        </span>
        <label className="flex items-center gap-1 text-ink-300">
          speed
          <select aria-label="Replay speed" value={speed} onChange={(e) => setSpeed(Number(e.target.value))} className="rounded border border-ink-700 bg-ink-800 px-1 py-0.5">
            {SPEEDS.map((s) => (
              <option key={s} value={s}>
                {s} steps/s
              </option>
            ))}
          </select>
        </label>
      </div>
      {query.error && <p className="text-sm text-coral">{(query.error as Error).message}</p>}
      <div className="flex flex-wrap gap-6">
        <ReplayFloor plan={plan} masses={heat} estimate={data?.estimate ?? null} truth={data?.truth ?? null} goal={goal} />
        {data && (
          <dl className="grid h-fit grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm" data-testid="replay-readout">
            <dt className="text-ink-500">Event</dt>
            <dd>{describe(data.event)}</dd>
            <dt className="text-ink-500">Most likely</dt>
            <dd className="font-mono">
              ({data.estimate.row}, {data.estimate.col}) facing {data.estimate.heading}
            </dd>
            <dt className="text-ink-500">Certainty</dt>
            <dd className="font-mono">{(data.estimate.tileMass * 100).toFixed(0)} %</dd>
            {data.truth && (
              <>
                <dt className="text-ink-500">True pose</dt>
                <dd className="font-mono">
                  ({data.truth.row}, {data.truth.col}) facing {data.truth.heading}
                </dd>
                <dt className="text-ink-500">Error</dt>
                <dd className="font-mono">{data.errorTiles === 1 ? "1 tile" : `${data.errorTiles} tiles`}</dd>
              </>
            )}
          </dl>
        )}
      </div>
    </section>
  );
}

/** Replay of one mission: scrub or play through its belief updates (each move, reading and pose hint) and see the belief as it was then. */
export function MissionReplay(props: { missionId: number; steps: number; plan: FloorplanView; goal: { row: number; col: number } }) {
  const [client] = useState(() => new QueryClient());
  return (
    <QueryClientProvider client={client}>
      <Replay {...props} />
    </QueryClientProvider>
  );
}
