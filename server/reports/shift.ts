/**
 * The shift summary, aggregated in MariaDB: missions started in [from, to) — on one
 * floorplan when asked, by the floorplan of the version each mission pinned — counted by
 * outcome, their time under way, holds by reason, the median time to reach and the
 * certainty statistics, per robot and in total. Every query groups in SQL; no mission
 * rows travel to Node.
 *
 * Holds are the server's `hold` commands logged against those missions (events of kind
 * "hold", source "server", payload.reason), reached through events_mission_idx; a hold of
 * a robot with no mission belongs to no mission and is not counted.
 */
import { sql, type SQL } from "drizzle-orm";
import type { Db } from "../../db/client";
import type { ShiftFigures, ShiftRange, ShiftRobotRow, ShiftSummary, HoldsByReason } from "../../lib/protocol/reports";
import { HOLD_REASONS, MISSION_STATES, type HoldReason } from "../../lib/vocabulary";

async function rowsOf<T>(db: Db, query: SQL): Promise<T[]> {
  const [rows] = (await db.execute(query)) as unknown as [T[]];
  return rows;
}

/**
 * The missions of a range. Every mission is in one of MISSION_STATES, so naming them all
 * changes no result but lets missions_state_idx (state, started_at) serve the range as four
 * index ranges instead of a scan of the whole table.
 */
export function shiftScope(range: ShiftRange): SQL {
  const floorplan = range.floorplanId === undefined ? sql`` : sql` AND v.floorplan_id = ${range.floorplanId}`;
  const states = sql.join(MISSION_STATES.map((s) => sql`${s}`), sql`, `);
  return sql`m.state IN (${states}) AND m.started_at >= ${new Date(range.from)} AND m.started_at < ${new Date(range.to)}${floorplan}`;
}

interface FigureRow {
  robot_id: string | null;
  robot_name: string | null;
  started: number | string;
  reached: number | string;
  aborted: number | string;
  failed: number | string;
  active: number | string;
  under_way_s: number | string | null;
  certainty_min: number | null;
  certainty_mean: number | string | null;
}

const num = (v: number | string | null): number | null => (v === null ? null : Number(v));

function noHolds(): HoldsByReason {
  return Object.fromEntries(HOLD_REASONS.map((r) => [r, 0])) as HoldsByReason;
}

/** The summary of the missions started in the range. */
export async function shiftSummary(db: Db, range: ShiftRange): Promise<ShiftSummary> {
  // A mission still under way counts up to the end of the range, or up to now if that is sooner.
  const cap = new Date(Math.min(range.to, Date.now()));
  const end = new Date(range.to);
  const where = shiftScope(range);

  const figures = await rowsOf<FigureRow>(
    db,
    sql`SELECT m.robot_id, MAX(r.name) AS robot_name,
          COUNT(*) AS started,
          SUM(m.state = 'reached') AS reached,
          SUM(m.state = 'aborted') AS aborted,
          SUM(m.state = 'failed') AS failed,
          SUM(m.state = 'active') AS active,
          SUM(GREATEST(0, TIMESTAMPDIFF(MICROSECOND, m.started_at, LEAST(COALESCE(m.ended_at, ${cap}), ${end})))) / 1e6 AS under_way_s,
          MIN(m.min_certainty) AS certainty_min,
          AVG(m.min_certainty) AS certainty_mean
        FROM missions m
        JOIN floorplan_versions v ON v.id = m.version_id
        LEFT JOIN robots r ON r.id = m.robot_id
        WHERE ${where}
        GROUP BY m.robot_id WITH ROLLUP`,
  );

  const medians = await rowsOf<{ robot_id: string; per_robot: number | string; overall: number | string }>(
    db,
    sql`SELECT DISTINCT d.robot_id,
          MEDIAN(d.seconds) OVER (PARTITION BY d.robot_id) AS per_robot,
          MEDIAN(d.seconds) OVER () AS overall
        FROM (
          SELECT m.robot_id, TIMESTAMPDIFF(MICROSECOND, m.started_at, m.ended_at) / 1e6 AS seconds
          FROM missions m
          JOIN floorplan_versions v ON v.id = m.version_id
          WHERE ${where} AND m.state = 'reached' AND m.ended_at IS NOT NULL
        ) d`,
  );

  const holds = await rowsOf<{ robot_id: string; reason: string; holds: number | string }>(
    db,
    sql`SELECT m.robot_id, JSON_UNQUOTE(JSON_EXTRACT(e.payload, '$.reason')) AS reason, COUNT(*) AS holds
        FROM missions m
        JOIN floorplan_versions v ON v.id = m.version_id
        JOIN events e ON e.mission_id = m.id AND e.kind = 'hold' AND e.source = 'server'
        WHERE ${where}
        GROUP BY m.robot_id, reason`,
  );

  const holdsOf = new Map<string, HoldsByReason>();
  const totalHolds = noHolds();
  for (const h of holds) {
    if (!(HOLD_REASONS as readonly string[]).includes(h.reason)) continue;
    const reason = h.reason as HoldReason;
    const count = Number(h.holds);
    const robot = holdsOf.get(h.robot_id) ?? noHolds();
    robot[reason] += count;
    holdsOf.set(h.robot_id, robot);
    totalHolds[reason] += count;
  }
  const medianOf = new Map(medians.map((m) => [m.robot_id, Number(m.per_robot)]));
  const overallMedian = medians.length ? Number(medians[0].overall) : null;

  const toFigures = (row: FigureRow | undefined, median: number | null, holdCounts: HoldsByReason): ShiftFigures => ({
    started: Number(row?.started ?? 0),
    reached: Number(row?.reached ?? 0),
    aborted: Number(row?.aborted ?? 0),
    failed: Number(row?.failed ?? 0),
    active: Number(row?.active ?? 0),
    underWayS: num(row?.under_way_s ?? null) ?? 0,
    medianReachS: median,
    certaintyMin: num(row?.certainty_min ?? null),
    certaintyMean: num(row?.certainty_mean ?? null),
    holds: holdCounts,
  });

  const rollup = figures.find((f) => f.robot_id === null);
  const robots: ShiftRobotRow[] = figures
    .filter((f): f is FigureRow & { robot_id: string } => f.robot_id !== null)
    .map((f) => ({
      robotId: f.robot_id,
      robotName: f.robot_name ?? f.robot_id,
      ...toFigures(f, medianOf.get(f.robot_id) ?? null, holdsOf.get(f.robot_id) ?? noHolds()),
    }))
    .sort((a, b) => a.robotName.localeCompare(b.robotName) || a.robotId.localeCompare(b.robotId));

  return {
    from: range.from,
    to: range.to,
    floorplanId: range.floorplanId ?? null,
    totals: toFigures(rollup, overallMedian, totalHolds),
    robots,
  };
}
