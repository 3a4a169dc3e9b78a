/** The logbook's queries: missions with filters and server-side paging, a mission's events, exports. */
import { and, asc, count, desc, eq, gt, gte, inArray, lte, type SQL } from "drizzle-orm";
import { z } from "zod";
import { events, floorplanVersions, missions, robots, type MissionRow } from "../db/schema";
import { MISSION_STATES } from "../lib/vocabulary";
import { appDb } from "./db";

export const MissionListQuery = z.object({
  robot: z.string().max(40).optional(),
  outcome: z.enum(MISSION_STATES).optional(),
  floorplan: z.coerce.number().int().positive().optional(),
  from: z.coerce.date().optional(),
  to: z.coerce.date().optional(),
  page: z.coerce.number().int().min(1).default(1),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type MissionListQuery = z.infer<typeof MissionListQuery>;

/** A mission as the logbook and a robot's page list it. */
export function missionSummary(m: MissionRow) {
  return {
    id: m.id,
    goal: { row: m.goalRow, col: m.goalCol },
    state: m.state,
    steps: m.steps,
    holds: m.holds,
    minCertainty: m.minCertainty,
    startedAt: m.startedAt.getTime(),
    endedAt: m.endedAt ? m.endedAt.getTime() : null,
  };
}

/** One page of missions, newest first, with the total for the filters (indexes on robot, state and start). */
export async function listMissions(q: MissionListQuery) {
  const db = appDb();
  const where: SQL[] = [];
  if (q.robot) where.push(eq(missions.robotId, q.robot));
  if (q.outcome) where.push(eq(missions.state, q.outcome));
  if (q.from) where.push(gte(missions.startedAt, q.from));
  if (q.to) where.push(lte(missions.startedAt, q.to));
  // The floorplan a mission ran on is its pinned version's, whatever the robot is on now.
  if (q.floorplan) where.push(inArray(missions.versionId, db.select({ id: floorplanVersions.id }).from(floorplanVersions).where(eq(floorplanVersions.floorplanId, q.floorplan))));
  const condition = where.length ? and(...where) : undefined;
  const [{ total }] = await db.select({ total: count() }).from(missions).where(condition);
  const rows = await db
    .select({ mission: missions, robotName: robots.name })
    .from(missions)
    .leftJoin(robots, eq(robots.id, missions.robotId))
    .where(condition)
    .orderBy(desc(missions.startedAt), desc(missions.id))
    .limit(q.limit)
    .offset((q.page - 1) * q.limit);
  return {
    total,
    items: rows.map(({ mission: m, robotName }) => ({
      ...missionSummary(m),
      robotId: m.robotId,
      robotName: robotName ?? m.robotId,
      versionId: m.versionId,
      durationS: m.endedAt ? Math.round((m.endedAt.getTime() - m.startedAt.getTime()) / 1000) : null,
    })),
  };
}

export const EventPageQuery = z.object({
  after: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
});

/** A page of one mission's events in the order they were applied; `next` is the cursor for the page after. */
export async function missionEvents(missionId: number, after: number, limit: number) {
  const rows = await appDb()
    .select()
    .from(events)
    .where(and(eq(events.missionId, missionId), gt(events.id, after)))
    .orderBy(asc(events.id))
    .limit(limit);
  const items = rows.map((e) => ({
    id: e.id,
    seq: e.seq,
    source: e.source,
    kind: e.kind,
    payload: e.payload,
    robotAt: e.robotAt,
    receivedAt: e.receivedAt.getTime(),
  }));
  return { items, next: items.length === limit ? items[items.length - 1].id : null };
}

export type MissionEvent = Awaited<ReturnType<typeof missionEvents>>["items"][number];

const CSV_COLUMNS = ["id", "seq", "source", "kind", "robotAt", "receivedAt", "payload"] as const;

function csvCell(value: unknown): string {
  const text = value === null || value === undefined ? "" : typeof value === "object" ? JSON.stringify(value) : String(value);
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * A mission's events as CSV or JSON, streamed a page at a time from the database, so a
 * long mission never sits in memory whole.
 */
export function exportMissionEvents(missionId: number, format: "csv" | "json", pageSize = 500): ReadableStream<Uint8Array> {
  const encoder = new TextEncoder();
  let after = 0;
  let first = true;
  let finished = false;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (finished) return;
      if (first && format === "csv") controller.enqueue(encoder.encode(`${CSV_COLUMNS.join(",")}\n`));
      if (first && format === "json") controller.enqueue(encoder.encode("["));
      const page = await missionEvents(missionId, after, pageSize);
      const chunk =
        format === "csv"
          ? page.items.map((e) => CSV_COLUMNS.map((c) => csvCell(e[c])).join(",")).join("\n") + (page.items.length ? "\n" : "")
          : page.items.map((e, i) => `${first && i === 0 ? "" : ","}\n${JSON.stringify(e)}`).join("");
      if (chunk) controller.enqueue(encoder.encode(chunk));
      if (page.items.length) first = false;
      if (page.next === null) {
        if (format === "json") controller.enqueue(encoder.encode("\n]\n"));
        finished = true;
        controller.close();
        return;
      }
      after = page.next;
    },
  });
}
