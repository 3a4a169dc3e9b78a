import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PrintButton } from "@/components/logbook/PrintButton";
import { appDbForRoutes, certaintyCurve, listNotes, missionDetail, replayMission, requirePageRole, runningFleet } from "@/server/facade";

export const metadata: Metadata = { title: "Mission summary" };

function utc(ms: number | null): string {
  return ms === null ? "—" : `${new Date(ms).toISOString().slice(0, 19).replace("T", " ")} UTC`;
}

function duration(ms: number): string {
  const s = Math.round(ms / 1000);
  return s < 60 ? `${s} s` : `${Math.floor(s / 60)} min ${s % 60} s`;
}

/** One mission on one printable page: what it was, how it went, its holds and its notes. */
export default async function MissionSummaryPage({ params }: { params: Promise<{ id: string }> }) {
  const { id: raw } = await params;
  await requirePageRole("viewer", `/logbook/${raw}/summary`);
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const { mission } = await missionDetail(id).catch(() => notFound());
  const fleet = runningFleet();
  const [final, curve, notes] = await Promise.all([
    replayMission(fleet, id).catch(() => null),
    certaintyCurve(fleet, id).catch(() => null),
    listNotes(appDbForRoutes(), id),
  ]);
  const c = final?.certainty;
  const facts: [string, string][] = [
    ["Robot", mission.robotName],
    ["Floorplan version", String(mission.versionId)],
    ["Goal tile", `(${mission.goal.row}, ${mission.goal.col})`],
    ["Outcome", mission.state],
    ["Started", utc(mission.startedAt)],
    ["Ended", utc(mission.endedAt)],
    ["Duration", mission.endedAt ? duration(mission.endedAt - mission.startedAt) : "still under way"],
    ["Steps", String(mission.steps)],
    ["Holds", String(mission.holds)],
    ["Lowest certainty", mission.minCertainty === null ? "—" : `${Math.round(mission.minCertainty * 100)} %`],
    ["Final estimate", c ? `(${c.row}, ${c.col}), ${Math.round(c.tileMass * 100)} % on that tile` : "—"],
  ];
  if (final?.truth) facts.push(["True pose at the end", `(${final.truth.row}, ${final.truth.col}) facing ${final.truth.heading}`]);
  return (
    <article className="mx-auto max-w-3xl space-y-5 p-6 print:p-0" data-testid="mission-summary">
      <header className="flex items-baseline justify-between gap-3">
        <h1 className="text-xl font-semibold">Mission #{mission.id} — summary</h1>
        <div className="flex items-center gap-3 print:hidden">
          <PrintButton />
          <Link href={`/logbook/${id}`} className="text-sm text-ink-300">
            Back to the mission
          </Link>
        </div>
      </header>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-sm">
        {facts.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-ink-500">{k}</dt>
            <dd className="font-mono">{v}</dd>
          </div>
        ))}
      </dl>
      <section>
        <h2 className="mb-1 font-semibold">Holds and releases</h2>
        {curve && curve.marks.length > 0 ? (
          <ul className="text-sm">
            {curve.marks.map((m) => (
              <li key={`${m.kind}-${m.at}`} className="font-mono">
                {utc(m.at)} · after step {m.step} · {m.kind}
                {m.reason ? ` (${m.reason.replace("_", " ")})` : ""}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-ink-500">None.</p>
        )}
        {curve && (
          <p className="mt-1 text-sm text-ink-300">
            Certainty was under the hold threshold of {Math.round(curve.holdBelow * 100)} % on {curve.stepsBelowHold} of {curve.points.length} replayed steps.
          </p>
        )}
      </section>
      <section>
        <h2 className="mb-1 font-semibold">Notes</h2>
        {notes.length === 0 && <p className="text-sm text-ink-500">None.</p>}
        {notes.map((n) => (
          <div key={n.id} className="mb-2 break-inside-avoid text-sm">
            <p className="text-xs text-ink-500">
              {n.author} · {utc(n.createdAt)}
              {n.step !== null ? ` · at step ${n.step}` : ""}
            </p>
            <p className="whitespace-pre-wrap">{n.text}</p>
            <div className="mt-1 flex gap-2">
              {n.photos.map((p) => (
                // A plain img: thumbnails come from Tessera's own API with the session cookie.
                <img key={p.id} src={`/api/missions/${id}/photos/${p.id}?size=thumb`} alt={`Photo on the note by ${n.author}`} className="h-20 rounded border border-ink-700" />
              ))}
            </div>
          </div>
        ))}
      </section>
      <footer className="border-t border-ink-700 pt-2 text-xs text-ink-500">Printed from Tessera&apos;s logbook. The replayed figures are re-run from the logged messages.</footer>
    </article>
  );
}
