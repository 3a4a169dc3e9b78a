/**
 * Storage loss. When a write fails and MariaDB does not answer a probe either, the fleet
 * is "storage down": robot messages are refused `internal` at once (robots keep and
 * resend them, PROTOCOL.md) without being applied or queued, so nothing runs ahead of
 * the log and memory stays flat however long the outage lasts. A probe asks MariaDB
 * every second; once it answers, `restore` rebuilds the fleet from what was stored while
 * messages are still refused, and only then are messages applied again.
 */
import type { HoldReason } from "../../lib/vocabulary";
import { logger } from "../logger";

const PROBE_EVERY_MS = 1000;
const PROBE_TIMEOUT_MS = 2000;

/** A robot held because its messages could not be stored. */
export interface StorageHold {
  since: number;
  /** The hold it had before (kept after the outage when an operator or low certainty put it there). */
  previous: HoldReason | null;
}

export interface StorageWatchOptions {
  /** One cheap round trip to the database (SELECT 1); rejects when storage does not answer. */
  probe: () => Promise<unknown>;
  /** Runs once storage answers again, before messages are applied; a throw keeps storage down and probing. */
  restore: () => Promise<void>;
}

function withTimeout(work: Promise<unknown>, ms: number): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms);
  });
  return Promise.race([work, timeout]).then(
    () => clearTimeout(timer),
    (err: unknown) => {
      clearTimeout(timer);
      throw err;
    },
  );
}

export class StorageWatch {
  private downSince: number | null = null;
  private timer: NodeJS.Timeout | undefined;
  private probing: Promise<boolean> | null = null;
  private stopped = false;
  /** At most one entry per robot of the fleet, so its size is bounded by the roster. */
  readonly held = new Map<string, StorageHold>();

  constructor(private readonly opts: StorageWatchOptions) {}

  get down(): boolean {
    return this.downSince !== null;
  }

  /** After a failed write: whether storage is down (already, or now that the probe failed too). */
  async check(err: unknown): Promise<boolean> {
    if (this.down) return true;
    if (await this.answers()) return false;
    if (!this.down) {
      this.downSince = Date.now();
      logger.error({ err }, "storage down: MariaDB does not answer; refusing robot messages until it does");
      this.schedule();
    }
    return true;
  }

  stop(): void {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
  }

  /** One probe at a time: failures of many robots at once share it. */
  private answers(): Promise<boolean> {
    this.probing ??= withTimeout(this.opts.probe(), PROBE_TIMEOUT_MS).then(
      () => true,
      () => false,
    );
    const probing = this.probing;
    void probing.finally(() => {
      if (this.probing === probing) this.probing = null;
    });
    return probing;
  }

  // A chain of timeouts rather than an interval, so a slow probe and a restore never overlap the next round.
  private schedule(): void {
    if (this.stopped) return;
    this.timer = setTimeout(() => void this.round(), PROBE_EVERY_MS);
    this.timer.unref();
  }

  private async round(): Promise<void> {
    if (!(await this.answers())) {
      this.schedule();
      return;
    }
    const since = this.downSince ?? Date.now();
    try {
      await this.opts.restore();
    } catch (err) {
      logger.error({ err }, "storage answers again but the fleet could not be rebuilt yet; retrying");
      this.schedule();
      return;
    }
    this.held.clear();
    this.downSince = null;
    logger.warn({ downMs: Date.now() - since }, "storage back: robots rebuilt from the database, messages applied again");
  }
}
