/**
 * Fencing in the write path: a node writes a robot's events only under the fence of its
 * lease, and only while no node has written under a newer one. The check is one UPDATE of
 * the robots' rows inside the batch's own transaction, so the row locks it takes also make
 * a takeover wait for a batch of the old owner that is already under way.
 */
import { inArray, sql } from "drizzle-orm";
import type { Db } from "../../db/client";
import { robots } from "../../db/schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** A batch (or takeover) refused because another node owns the robot now. */
export class FencedError extends Error {
  constructor(readonly robotIds: string[]) {
    super(`this node no longer owns robot ${robotIds.join(", ")}: another node holds a newer lease`);
    this.name = "FencedError";
  }
}

function affected(result: unknown): number {
  return (result as [{ affectedRows: number }])[0].affectedRows;
}

/**
 * Raises each robot's stored fence to ours, failing with FencedError when any robot's
 * stored fence is newer or the robot is not ours at all (no fence known).
 */
export async function checkFences(tx: Tx | Db, robotIds: Iterable<string>, fenceOf: (robotId: string) => number | undefined): Promise<void> {
  const ids = [...new Set(robotIds)];
  if (ids.length === 0) return;
  const unowned = ids.filter((id) => fenceOf(id) === undefined);
  if (unowned.length) throw new FencedError(unowned);
  const fenceCase = sql`CASE id ${sql.join(
    ids.map((id) => sql`WHEN ${id} THEN ${fenceOf(id)}`),
    sql` `,
  )} END`;
  // On a table this small the optimiser would rather scan it, and a scanning UPDATE locks
  // every row until commit, so two nodes' batches would wait on each other. The forced
  // primary-key lookup locks the batch's own robots' rows and no others.
  const result = await tx.execute(
    sql`UPDATE robots FORCE INDEX (PRIMARY) SET fence = ${fenceCase} WHERE id IN (${sql.join(
      ids.map((id) => sql`${id}`),
      sql`, `,
    )}) AND fence <= ${fenceCase}`,
  );
  // mysql2 connects with FOUND_ROWS, so rows already at our fence count as matched.
  if (affected(result) === ids.length) return;
  const rows = await tx.select({ id: robots.id, fence: robots.fence }).from(robots).where(inArray(robots.id, ids));
  throw new FencedError(rows.filter((r) => r.fence > (fenceOf(r.id) as number)).map((r) => r.id));
}
