/**
 * Batched, ordered writes of the fleet: events, belief snapshots and mission counters
 * queued during one short tick are committed in one transaction with one multi-row
 * insert per table, so many robots cost few round trips. Callers await `commit()` and
 * only then acknowledge a robot's message (durability before acknowledgement).
 */
import { eq, sql } from "drizzle-orm";
import type { Db } from "../../db/client";
import { beliefs, events, missions, type NewEventRow } from "../../db/schema";

export interface QueuedEvent {
  row: NewEventRow;
  /** The event's id, known once its batch is committed. */
  id?: number;
}

export interface QueuedSnapshot {
  robotId: string;
  /** The event the snapshot follows: queued in this or an earlier batch, or an id. */
  after: QueuedEvent | number;
  missionId: number | null;
  versionId: number;
  belief: Float64Array;
  tileMass: number;
  entropy: number;
}

export interface MissionCounters {
  steps?: number;
  holds?: number;
  minCertainty?: number;
}

interface Batch {
  events: QueuedEvent[];
  snapshots: QueuedSnapshot[];
  missions: Map<number, MissionCounters>;
  done: Promise<void>;
  resolve: () => void;
  reject: (err: unknown) => void;
}

function newBatch(): Batch {
  let resolve!: () => void;
  let reject!: (err: unknown) => void;
  const done = new Promise<void>((res, rej) => {
    resolve = res;
    reject = rej;
  });
  // A batch nobody awaits must not surface as an unhandled rejection.
  done.catch(() => {});
  return { events: [], snapshots: [], missions: new Map(), done, resolve, reject };
}

export interface WriterStats {
  batches: number;
  events: number;
  snapshots: number;
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Runs first inside each batch's transaction with the robots the batch writes for; throwing fails the batch. */
export type WriteGuard = (tx: Tx, robotIds: Set<string>) => Promise<void>;

export class FleetWriter {
  /** Set when several nodes share the fleet: the ownership fence check (server/cluster/fence.ts). */
  guard: WriteGuard | undefined;
  private open: Batch = newBatch();
  private timer: NodeJS.Timeout | undefined;
  private inFlight: Promise<void> = Promise.resolve();
  readonly stats: WriterStats = { batches: 0, events: 0, snapshots: 0 };

  constructor(
    private readonly db: Db,
    private readonly tickMs: number,
  ) {}

  event(row: NewEventRow): QueuedEvent {
    const queued: QueuedEvent = { row };
    this.open.events.push(queued);
    this.schedule();
    return queued;
  }

  snapshot(snapshot: QueuedSnapshot): void {
    this.open.snapshots.push({ ...snapshot, belief: Float64Array.from(snapshot.belief) });
    this.schedule();
  }

  mission(id: number, counters: MissionCounters): void {
    this.open.missions.set(id, { ...this.open.missions.get(id), ...counters });
    this.schedule();
  }

  /** Resolves when everything queued so far is committed; rejects when that batch failed. */
  commit(): Promise<void> {
    this.schedule();
    return this.open.done;
  }

  /** Commits what is queued now, without waiting for the tick. */
  async flush(): Promise<void> {
    if (this.timer) {
      clearTimeout(this.timer);
      this.timer = undefined;
    }
    const batch = this.open;
    this.open = newBatch();
    await this.run(batch);
  }

  private schedule(): void {
    if (this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = undefined;
      const batch = this.open;
      this.open = newBatch();
      void this.run(batch).catch(() => {});
    }, this.tickMs);
  }

  private run(batch: Batch): Promise<void> {
    // Batches commit strictly one after another so event ids follow the order of application.
    const next = this.inFlight.then(() => this.write(batch));
    this.inFlight = next.catch(() => {});
    return next;
  }

  private async write(batch: Batch): Promise<void> {
    if (batch.events.length === 0 && batch.snapshots.length === 0 && batch.missions.size === 0) {
      batch.resolve();
      return;
    }
    try {
      await this.db.transaction(async (tx) => {
        if (this.guard) await this.guard(tx, new Set([...batch.events.map((e) => e.row.robotId), ...batch.snapshots.map((s) => s.robotId)]));
        if (batch.events.length > 0) {
          const ids = await tx.insert(events).values(batch.events.map((e) => e.row)).$returningId();
          ids.forEach((row, i) => (batch.events[i].id = row.id));
        }
        if (batch.snapshots.length > 0) {
          await tx.insert(beliefs).values(
            batch.snapshots.map((s) => {
              const eventId = typeof s.after === "number" ? s.after : s.after.id;
              if (eventId === undefined) throw new Error(`snapshot of ${s.robotId} follows an event that was never written`);
              return {
                robotId: s.robotId,
                eventId,
                missionId: s.missionId,
                versionId: s.versionId,
                belief: Buffer.from(s.belief.buffer, s.belief.byteOffset, s.belief.byteLength),
                tileMass: s.tileMass,
                entropy: s.entropy,
                createdAt: new Date(),
              };
            }),
          );
        }
        for (const [id, counters] of batch.missions) {
          const set: Record<string, unknown> = {};
          if (counters.steps !== undefined) set.steps = counters.steps;
          if (counters.holds !== undefined) set.holds = counters.holds;
          if (counters.minCertainty !== undefined) set.minCertainty = sql`LEAST(COALESCE(${missions.minCertainty}, 1), ${counters.minCertainty})`;
          await tx.update(missions).set(set).where(eq(missions.id, id));
        }
      });
      this.stats.batches += 1;
      this.stats.events += batch.events.length;
      this.stats.snapshots += batch.snapshots.length;
      batch.resolve();
    } catch (err) {
      for (const e of batch.events) e.id = undefined;
      batch.reject(err);
      throw err;
    }
  }
}
