/**
 * The nothing-lost check of the reliability suites: every message a robot saw
 * acknowledged is in the events table exactly once, and a belief rebuilt from the
 * database (latest snapshot plus later events, as a restarted server does) is the one
 * the live server holds.
 */
import { and, eq, inArray } from "drizzle-orm";
import type { Db } from "../../db/client";
import { events, robots } from "../../db/schema";
import { tileMarginal } from "../../lib/belief";
import { quantiseMarginal } from "../../lib/protocol";
import { fleetConfig } from "../../server/config";
import { Fleet } from "../../server/fleet/fleet";

export interface LostReport {
  /** Acknowledged seqs with no stored event, per robot. */
  missing: Record<string, number[]>;
  /** Seqs stored more than once, per robot (the unique index should make this impossible). */
  duplicated: Record<string, number[]>;
  checked: number;
}

/** Compares the seqs each robot saw acknowledged with the robot events stored for it. */
export async function checkNothingLost(db: Db, acked: Map<string, Iterable<number>>): Promise<LostReport> {
  const report: LostReport = { missing: {}, duplicated: {}, checked: 0 };
  for (const [robotId, seqs] of acked) {
    const wanted = [...new Set(seqs)];
    report.checked += wanted.length;
    if (wanted.length === 0) continue;
    const stored = new Map<number, number>();
    for (let i = 0; i < wanted.length; i += 5000) {
      const rows = await db
        .select({ seq: events.seq })
        .from(events)
        .where(and(eq(events.robotId, robotId), inArray(events.seq, wanted.slice(i, i + 5000))));
      for (const row of rows) stored.set(Number(row.seq), (stored.get(Number(row.seq)) ?? 0) + 1);
    }
    const missing = wanted.filter((s) => !stored.has(s));
    const duplicated = [...stored].filter(([, n]) => n > 1).map(([s]) => s);
    if (missing.length) report.missing[robotId] = missing;
    if (duplicated.length) report.duplicated[robotId] = duplicated;
  }
  return report;
}

/** The belief a server started now would hold for `robotId`, rebuilt in a Fleet of its own. */
export async function rebuiltBelief(db: Db, robotId: string): Promise<{ belief: Float64Array; marginal: Float32Array }> {
  const row = (await db.select().from(robots).where(eq(robots.id, robotId)).limit(1))[0];
  if (!row) throw new Error(`robot ${robotId} is not on the roster`);
  const runtime = await new Fleet(db, fleetConfig()).load(row);
  return { belief: Float64Array.from(runtime.filter.belief), marginal: tileMarginal(runtime.plan, runtime.filter.belief) };
}

/** The rebuilt belief as a dashboard's belief frame would carry it, to compare with frames from a server in another process. */
export async function rebuiltFrame(db: Db, robotId: string): Promise<{ scale: number; data: number[] }> {
  const q = quantiseMarginal((await rebuiltBelief(db, robotId)).marginal);
  return { scale: q.scale, data: [...q.data] };
}
