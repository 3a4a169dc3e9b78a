import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { MissionNotes } from "@/components/logbook/MissionNotes";
import { MissionReplay } from "@/components/logbook/MissionReplay";
import { roleAllows } from "@/lib/roles";
import { appDbForRoutes, floorplanView, listNotes, missionDetail, missionEvents, replayMission, requirePageRole, robotModels, runningFleet } from "@/server/facade";

export const metadata: Metadata = { title: "Mission" };

function summary(kind: string, payload: Record<string, unknown>): string {
  switch (kind) {
    case "moved":
      return `carried out ${String(payload.action)}`;
    case "sensed":
      return `${(payload.readings as unknown[]).length} readings`;
    case "next":
      return `step ${String(payload.step)}: ${String(payload.action)}`;
    case "hold":
      return `hold (${String(payload.reason)})`;
    case "done":
      return `done: ${String(payload.outcome)}`;
    case "dispatch":
      return `dispatched by ${String(payload.by)}`;
    case "relocate":
      return `pose hint (${String(payload.row)}, ${String(payload.col)}) by ${String(payload.by)}`;
    case "models":
      return "motion and sensor models retuned from the roster";
    case "truth":
      return `true pose (${String(payload.row)}, ${String(payload.col)}) ${String(payload.heading)}`;
    default:
      return kind;
  }
}

export default async function MissionPage({ params }: { params: Promise<{ id: string }> }) {
  const { id: raw } = await params;
  const user = await requirePageRole("viewer", `/logbook/${raw}`);
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const { mission } = await missionDetail(id).catch(() => notFound());
  const plan = await floorplanView(mission.floorplanId, mission.versionId);
  const replay = await replayMission(runningFleet(), id).catch(() => null);
  const models = await robotModels(runningFleet(), mission.robotId).catch(() => null);
  const { items, next } = await missionEvents(id, 0, 300);
  const notes = await listNotes(appDbForRoutes(), id);
  // Notes sit on the timeline at the time they were written, among the messages.
  const rows = [
    ...items.map((e) => ({ key: `e${e.id}`, at: e.receivedAt, source: e.source, seq: e.seq, kind: e.kind, text: summary(e.kind, e.payload as Record<string, unknown>) })),
    ...notes
      .filter((n) => next === null || n.createdAt <= (items.at(-1)?.receivedAt ?? 0))
      .map((n) => ({ key: `n${n.id}`, at: n.createdAt, source: n.author, seq: null, kind: "note", text: `${n.step !== null ? `at step ${n.step}: ` : ""}${n.text}${n.photos.length ? ` (${n.photos.length} photo${n.photos.length > 1 ? "s" : ""})` : ""}` })),
  ].sort((a, b) => a.at - b.at);
  return (
    <section className="mx-auto max-w-6xl space-y-5 p-6">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h1 className="text-xl font-semibold">
          Mission #{mission.id} · {mission.robotName} to ({mission.goal.row}, {mission.goal.col})
        </h1>
        <div className="flex gap-3 text-sm">
          <Link className="text-tide underline underline-offset-2" href={`/logbook/${id}/summary`}>
            Printable summary
          </Link>
          <a className="text-tide underline underline-offset-2" href={`/api/missions/${id}/export?format=csv`}>
            Events as CSV
          </a>
          <a className="text-tide underline underline-offset-2" href={`/api/missions/${id}/export?format=json`}>
            Events as JSON
          </a>
          <Link href="/logbook" className="text-ink-300">
            Back to the logbook
          </Link>
        </div>
      </div>
      <p className="text-sm text-ink-300">
        {mission.state} · {mission.steps} steps · {mission.holds} holds · lowest certainty{" "}
        {mission.minCertainty === null ? "—" : `${Math.round(mission.minCertainty * 100)} %`} · floorplan version {mission.versionId}
      </p>
      {plan && replay ? (
        <MissionReplay missionId={id} steps={replay.steps} plan={plan} goal={mission.goal} models={models} />
      ) : (
        <p className="rounded border border-dashed border-ink-700 p-4 text-sm text-ink-300">This mission has no starting belief stored, so it cannot be replayed.</p>
      )}
      <MissionNotes missionId={id} notes={notes} canWrite={roleAllows(user.role, "operator")} />
      <h2 className="text-lg font-semibold">Timeline</h2>
      <table className="w-full text-sm" data-testid="timeline">
        <thead className="text-left text-ink-500">
          <tr>
            <th className="py-1">Received (UTC)</th>
            <th>From</th>
            <th>Seq</th>
            <th>Event</th>
            <th>Summary</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className={r.kind === "note" ? "border-t border-ink-800 bg-ink-800/60" : "border-t border-ink-800"}>
              <td className="py-0.5 font-mono">{new Date(r.at).toISOString().slice(11, 23)}</td>
              <td>{r.source}</td>
              <td className="font-mono">{r.seq ?? ""}</td>
              <td className="font-mono">{r.kind}</td>
              <td>{r.text}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {next !== null && <p className="text-sm text-ink-500">The first 300 events are shown; the export has them all.</p>}
    </section>
  );
}
