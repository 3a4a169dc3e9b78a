"use client";

import { QueryClient, QueryClientProvider, keepPreviousData, useMutation, useQuery } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import type { FloorplanView } from "@/lib/protocol";
import type { CertaintyCurve, WhatIf, WhatIfResult } from "@/lib/protocol/what-if";
import { CertaintyChart, type ChartCurve } from "./CertaintyChart";
import { ReplayFloor, type ReplayPose } from "./ReplayFloor";
import { WhatIfForm, type ModelValues } from "./WhatIfForm";

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

async function answer<T>(res: Response): Promise<T> {
  const body = await res.json();
  if (!res.ok) throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
  return body as T;
}

async function fetchCurve(missionId: number): Promise<CertaintyCurve> {
  return answer(await fetch(`/api/missions/${missionId}/certainty`, { credentials: "same-origin" }));
}

async function postWhatIf(missionId: number, whatIf: WhatIf): Promise<WhatIfResult> {
  return answer(
    await fetch(`/api/missions/${missionId}/certainty`, {
      method: "POST",
      credentials: "same-origin",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(whatIf),
    }),
  );
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

interface ReplayProps {
  missionId: number;
  steps: number;
  plan: FloorplanView;
  goal: { row: number; col: number };
  /** The robot's current models, the what-if form's starting values; null when the robot has left the roster. */
  models: ModelValues | null;
}

function Replay({ missionId, steps, plan, goal, models }: ReplayProps) {
  const [step, setStep] = useState(steps);
  const curve = useQuery({ queryKey: ["certainty", missionId], queryFn: () => fetchCurve(missionId), staleTime: Infinity });
  const whatIf = useMutation({ mutationFn: (w: WhatIf) => postWhatIf(missionId, w) });
  const curves: ChartCurve[] = whatIf.data
    ? [
        { key: "live models", curve: whatIf.data.baseline },
        { key: "what-if", curve: whatIf.data.whatIf },
      ]
    : curve.data
      ? [{ key: "live models", curve: curve.data }]
      : [];
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
      <h2 className="text-lg font-semibold">Certainty over the mission</h2>
      {curve.error && <p className="text-sm text-coral">{(curve.error as Error).message}</p>}
      <CertaintyChart
        curves={curves}
        step={step}
        onPick={(s) => {
          setPlaying(false);
          setStep(s);
        }}
      />
      {models && (
        <details className="space-y-2" open={whatIf.data !== undefined}>
          <summary className="cursor-pointer text-sm text-ink-300">What-if: replay these messages with other parameters</summary>
          <WhatIfForm models={models} busy={whatIf.isPending} onRun={(w) => whatIf.mutate(w)} onClear={() => whatIf.reset()} />
          {whatIf.error && <p className="text-sm text-coral">{(whatIf.error as Error).message}</p>}
        </details>
      )}
    </section>
  );
}

/** Replay of one mission: scrub or play through its belief updates (each move, reading and pose hint) and see the belief as it was then. */
export function MissionReplay(props: ReplayProps) {
  const [client] = useState(() => new QueryClient());
  return (
    <QueryClientProvider client={client}>
      <Replay {...props} />
    </QueryClientProvider>
  );
}
