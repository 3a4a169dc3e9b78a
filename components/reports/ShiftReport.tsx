"use client";

import { keepPreviousData, QueryClient, QueryClientProvider, useMutation, useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { holdCount, ShiftSummarySchema, type ShiftSummary } from "@/lib/protocol/reports";
import { formatCertainty, formatDurationS, formatInstantUtc, HOLD_REASON_WORDS, OUTCOME_WORDS } from "@/lib/reports/format";
import { HOLD_REASONS } from "@/lib/vocabulary";
import { FigureBars, type Bar } from "./FigureBars";
import { fromLocalInput, RANGE_SHORTCUTS, shiftQueryString, toLocalInput, type PickedRange } from "./range";
import { RobotFigures } from "./RobotFigures";

export interface FloorplanChoice {
  id: number;
  name: string;
}

async function answerOf(res: Response): Promise<unknown> {
  const body: unknown = await res.json().catch(() => null);
  if (!res.ok) throw new Error((body as { error?: { message?: string; fields?: Record<string, string[]> } } | null)?.error ? describeError(body as never) : `The server answered ${res.status}.`);
  return body;
}

function describeError(body: { error: { message: string; fields?: Record<string, string[]> } }): string {
  const fields = Object.entries(body.error.fields ?? {}).map(([k, v]) => `${k} ${v.join("; ")}`);
  return [body.error.message, ...fields].join(" ");
}

async function fetchSummary(range: PickedRange): Promise<ShiftSummary> {
  const res = await fetch(`/api/reports/shift?${shiftQueryString(range)}`, { credentials: "same-origin" });
  return ShiftSummarySchema.parse(await answerOf(res));
}

async function postDigest(range: PickedRange): Promise<{ to: string[]; subject: string }> {
  const res = await fetch("/api/reports/shift/digest", {
    method: "POST",
    credentials: "same-origin",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ from: range.from, to: range.to, ...(range.floorplanId !== null ? { floorplan: range.floorplanId } : {}) }),
  });
  return (await answerOf(res)) as { to: string[]; subject: string };
}

function Figure({ label, value, tone = "text-ink-100" }: { label: string; value: string; tone?: string }) {
  return (
    <div className="rounded-lg border border-ink-700 bg-ink-900 px-3 py-2">
      <dt className="text-xs text-ink-500">{label}</dt>
      <dd className={`font-mono text-lg ${tone}`}>{value}</dd>
    </div>
  );
}

function outcomeBars(s: ShiftSummary): Bar[] {
  return [
    { label: OUTCOME_WORDS.reached, value: s.totals.reached, tone: "tide" },
    { label: OUTCOME_WORDS.aborted, value: s.totals.aborted, tone: "ink-300" },
    { label: OUTCOME_WORDS.failed, value: s.totals.failed, tone: "coral" },
    { label: OUTCOME_WORDS.active, value: s.totals.active, tone: "amberline" },
  ];
}

function holdBars(s: ShiftSummary): Bar[] {
  return HOLD_REASONS.map((r) => ({ label: HOLD_REASON_WORDS[r], value: s.totals.holds[r], tone: r === "fault" ? "coral" : "amberline" }));
}

function ShiftReportScreen({ floorplans, initialTo, canSendDigest }: { floorplans: FloorplanChoice[]; initialTo: number; canSendDigest: boolean }) {
  const [range, setRange] = useState<PickedRange>({ from: initialTo - RANGE_SHORTCUTS[0].ms, to: initialTo, floorplanId: null });
  const summary = useQuery({ queryKey: ["shift", range], queryFn: () => fetchSummary(range), placeholderData: keepPreviousData });
  const digest = useMutation({ mutationFn: postDigest });
  const s = summary.data;
  const setInstant = (key: "from" | "to") => (e: React.ChangeEvent<HTMLInputElement>) => {
    const ms = fromLocalInput(e.target.value);
    if (ms !== null) setRange((r) => ({ ...r, [key]: ms }));
  };

  return (
    <section className="mx-auto max-w-6xl space-y-5 p-6">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <div>
          <h1 className="text-xl font-semibold">Reports</h1>
          <p className="text-sm text-ink-500">Shift summary · {formatInstantUtc(range.from)} – {formatInstantUtc(range.to)}</p>
        </div>
        <div className="flex items-center gap-3 text-sm">
          <a href={`/api/reports/shift?${shiftQueryString(range, "csv")}`} download className="rounded-md border border-ink-700 px-3 py-1 text-ink-100 hover:border-tide/60">
            Download CSV
          </a>
          {canSendDigest && (
            <button type="button" onClick={() => digest.mutate(range)} disabled={digest.isPending} className="rounded-md border border-tide/60 px-3 py-1 text-tide disabled:opacity-50">
              {digest.isPending ? "Sending…" : "Send digest now"}
            </button>
          )}
        </div>
      </div>

      {canSendDigest && (digest.isSuccess || digest.isError) && (
        <p role="status" className={`rounded border px-3 py-2 text-sm ${digest.isError ? "border-coral/50 text-coral" : "border-tide/50 text-tide"}`}>
          {digest.isError ? digest.error.message : `Digest sent to ${digest.data.to.length} on call: “${digest.data.subject}”.`}
        </p>
      )}

      <form className="flex flex-wrap items-end gap-3 text-sm" aria-label="Report range" onSubmit={(e) => e.preventDefault()}>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">From</span>
          <input type="datetime-local" value={toLocalInput(range.from)} onChange={setInstant("from")} suppressHydrationWarning className="rounded border border-ink-700 bg-ink-800 px-2 py-1" />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">To</span>
          <input type="datetime-local" value={toLocalInput(range.to)} onChange={setInstant("to")} suppressHydrationWarning className="rounded border border-ink-700 bg-ink-800 px-2 py-1" />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">Floorplan</span>
          <select
            value={range.floorplanId ?? ""}
            onChange={(e) => setRange((r) => ({ ...r, floorplanId: e.target.value === "" ? null : Number(e.target.value) }))}
            className="rounded border border-ink-700 bg-ink-800 px-2 py-1"
          >
            <option value="">All floorplans</option>
            {floorplans.map((f) => (
              <option key={f.id} value={f.id}>
                {f.name}
              </option>
            ))}
          </select>
        </label>
        <div className="flex gap-2" role="group" aria-label="Range shortcuts">
          {RANGE_SHORTCUTS.map((shortcut) => {
            const on = range.to - range.from === shortcut.ms;
            return (
              <button
                key={shortcut.label}
                type="button"
                aria-pressed={on}
                onClick={() => {
                  const to = Date.now();
                  setRange((r) => ({ ...r, from: to - shortcut.ms, to }));
                }}
                className={`rounded-md border px-3 py-1 ${on ? "border-tide/60 text-tide" : "border-ink-700 text-ink-300"}`}
              >
                {shortcut.label}
              </button>
            );
          })}
        </div>
      </form>

      {summary.isError && (
        <p role="alert" className="rounded border border-coral/50 px-3 py-2 text-sm text-coral">
          {summary.error.message}
        </p>
      )}
      {!s && summary.isPending && <p className="text-sm text-ink-500">Adding up the shift…</p>}

      {s && (
        <div className={`space-y-5 ${summary.isFetching ? "opacity-70" : ""}`} aria-busy={summary.isFetching}>
          <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-5" aria-label="Headline figures">
            <Figure label="Missions started" value={String(s.totals.started)} />
            <Figure label="Reached" value={String(s.totals.reached)} tone="text-tide" />
            <Figure label="Aborted" value={String(s.totals.aborted)} />
            <Figure label="Failed" value={String(s.totals.failed)} tone={s.totals.failed ? "text-coral" : "text-ink-100"} />
            <Figure label="Still under way" value={String(s.totals.active)} />
            <Figure label="Time under way" value={formatDurationS(s.totals.underWayS)} />
            <Figure label="Median time to reach" value={formatDurationS(s.totals.medianReachS)} />
            <Figure label="Lowest certainty" value={formatCertainty(s.totals.certaintyMin)} />
            <Figure label="Mean lowest certainty" value={formatCertainty(s.totals.certaintyMean)} />
            <Figure label="Holds" value={String(holdCount(s.totals.holds))} tone={holdCount(s.totals.holds) ? "text-amberline" : "text-ink-100"} />
          </dl>
          <div className="grid gap-4 md:grid-cols-2">
            <FigureBars title="Missions by outcome" bars={outcomeBars(s)} />
            <FigureBars title="Holds by reason" bars={holdBars(s)} />
          </div>
          <div>
            <h2 className="mb-2 text-sm font-medium text-ink-300">Per robot</h2>
            <RobotFigures rows={s.robots} />
          </div>
        </div>
      )}
    </section>
  );
}

/** The shift summary page: range and floorplan pickers, figures, charts, per-robot table, CSV and digest. */
export function ShiftReport(props: { floorplans: FloorplanChoice[]; initialTo: number; canSendDigest: boolean }) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { mutations: { retry: false }, queries: { retry: false } } }));
  return (
    <QueryClientProvider client={client}>
      <ShiftReportScreen {...props} />
    </QueryClientProvider>
  );
}
