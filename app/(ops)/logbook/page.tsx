import type { Metadata } from "next";
import Link from "next/link";
import { MISSION_STATES } from "@/lib/vocabulary";
import { listMissions, MissionListQuery, requirePageRole, runningFleet } from "@/server/facade";

export const metadata: Metadata = { title: "Logbook" };

const OUTCOME_LABEL: Record<string, string> = { active: "Under way", reached: "Reached", aborted: "Aborted", failed: "Failed" };

function when(ms: number): string {
  return new Date(ms).toISOString().replace("T", " ").slice(0, 19);
}

export default async function LogbookPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requirePageRole("viewer", "/logbook");
  const raw = Object.fromEntries(Object.entries(await searchParams).flatMap(([k, v]) => (typeof v === "string" && v !== "" ? [[k, v]] : [])));
  const parsed = MissionListQuery.safeParse(raw);
  const query = parsed.success ? parsed.data : MissionListQuery.parse({});
  const { items, total } = await listMissions(query);
  const robots = runningFleet().frames().map((r) => ({ id: r.robotId, name: r.name }));
  const pages = Math.max(1, Math.ceil(total / query.limit));
  const pageLink = (page: number) => `/logbook?${new URLSearchParams({ ...raw, page: String(page) })}`;
  return (
    <section className="mx-auto max-w-6xl space-y-4 p-6">
      <h1 className="text-xl font-semibold">Logbook</h1>
      {!parsed.success && <p className="text-sm text-coral">Some filters were not valid and were ignored.</p>}
      <form className="flex flex-wrap items-end gap-3 text-sm" aria-label="Filter missions">
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">Robot</span>
          <select name="robot" defaultValue={query.robot ?? ""} className="rounded border border-ink-700 bg-ink-800 px-2 py-1">
            <option value="">All robots</option>
            {robots.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">Outcome</span>
          <select name="outcome" defaultValue={query.outcome ?? ""} className="rounded border border-ink-700 bg-ink-800 px-2 py-1">
            <option value="">Any</option>
            {MISSION_STATES.map((s) => (
              <option key={s} value={s}>
                {OUTCOME_LABEL[s]}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">From</span>
          <input type="date" name="from" defaultValue={typeof raw.from === "string" ? raw.from : ""} className="rounded border border-ink-700 bg-ink-800 px-2 py-1" />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">To</span>
          <input type="date" name="to" defaultValue={typeof raw.to === "string" ? raw.to : ""} className="rounded border border-ink-700 bg-ink-800 px-2 py-1" />
        </label>
        <button type="submit" className="rounded-md border border-tide/60 px-3 py-1 text-tide">
          Show
        </button>
      </form>
      <p className="text-sm text-ink-500" data-testid="mission-total">
        {total} missions · page {query.page} of {pages}
      </p>
      <table className="w-full text-sm">
        <thead className="text-left text-ink-500">
          <tr>
            <th className="py-1">Mission</th>
            <th>Robot</th>
            <th>Goal</th>
            <th>Started (UTC)</th>
            <th>Duration</th>
            <th>Outcome</th>
            <th>Steps</th>
            <th>Holds</th>
            <th>Lowest certainty</th>
          </tr>
        </thead>
        <tbody>
          {items.map((m) => (
            <tr key={m.id} className="border-t border-ink-800">
              <td className="py-1">
                <Link href={`/logbook/${m.id}`} className="text-tide underline underline-offset-2">
                  #{m.id}
                </Link>
              </td>
              <td>{m.robotName}</td>
              <td className="font-mono">
                ({m.goal.row}, {m.goal.col})
              </td>
              <td className="font-mono">{when(m.startedAt)}</td>
              <td className="font-mono">{m.durationS === null ? "—" : `${m.durationS} s`}</td>
              <td>{OUTCOME_LABEL[m.state]}</td>
              <td className="font-mono">{m.steps}</td>
              <td className="font-mono">{m.holds}</td>
              <td className="font-mono">{m.minCertainty === null ? "—" : `${Math.round(m.minCertainty * 100)} %`}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {items.length === 0 && <p className="rounded border border-dashed border-ink-700 p-4 text-sm text-ink-300">No missions match these filters.</p>}
      <nav aria-label="Pages" className="flex gap-3 text-sm">
        {query.page > 1 && <Link href={pageLink(query.page - 1)}>← Newer</Link>}
        {query.page < pages && <Link href={pageLink(query.page + 1)}>Older →</Link>}
      </nav>
    </section>
  );
}
