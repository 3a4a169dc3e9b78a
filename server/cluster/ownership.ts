/**
 * Which robots this node serves. A robot is served (its runtime is in the Fleet) only while
 * this node holds its lease; every other robot is "parked" here as its last known frame.
 * Taking a robot over raises its fence in the database first, then rebuilds it from the
 * database (snapshot plus later events), so whatever the previous owner committed is in
 * and nothing it writes afterwards can be.
 */
import { eq } from "drizzle-orm";
import type { Db } from "../../db/client";
import { robots } from "../../db/schema";
import type { RobotFrame } from "../../lib/protocol";
import { TesseraError } from "../errors";
import type { Fleet } from "../fleet/fleet";
import { logger } from "../logger";
import { checkFences } from "./fence";
import type { LeaseStore } from "./lease";

interface Held {
  fence: number;
  /** When Redis last confirmed the lease (or it was taken), by this node's clock. */
  confirmedAt: number;
}

export interface OwnershipOptions {
  renewMs: number;
  /** Longest wait for a robot's lease, after asking its owner to hand it over, ms. */
  claimTimeoutMs: number;
  /** Asks the other nodes to hand the robot over; resolves once they answered or timed out. */
  askHandover: (robotId: string) => Promise<void>;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export class Ownership {
  private readonly held = new Map<string, Held>();
  private readonly claiming = new Map<string, Promise<void>>();
  /** Last known frames of robots this node does not serve, shown offline until their owner reports them. */
  readonly parked = new Map<string, RobotFrame>();
  private timer: NodeJS.Timeout | undefined;
  private renewing = false;

  constructor(
    private readonly db: Db,
    private readonly fleet: Fleet,
    private readonly leases: LeaseStore,
    private readonly opts: OwnershipOptions,
  ) {}

  get nodeId(): string {
    return this.leases.nodeId;
  }

  fenceOf = (robotId: string): number | undefined => this.held.get(robotId)?.fence;

  owns(robotId: string): boolean {
    return this.held.has(robotId);
  }

  /** Parks every robot the Fleet loaded at start (none is owned yet) and starts renewing leases. */
  start(): void {
    this.fleet.writer.guard = (tx, ids) => checkFences(tx, ids, this.fenceOf);
    this.sweep();
    this.timer = setInterval(() => void this.renewAll(), this.opts.renewMs);
    this.timer.unref();
  }

  /** Makes this node the robot's owner: at once when the lease is free, else after a handover or the lease's expiry. */
  claim(robotId: string): Promise<void> {
    if (this.held.has(robotId)) return Promise.resolve();
    const running = this.claiming.get(robotId);
    if (running) return running;
    const claim = this.acquire(robotId).finally(() => this.claiming.delete(robotId));
    this.claiming.set(robotId, claim);
    return claim;
  }

  private async acquire(robotId: string): Promise<void> {
    const deadline = Date.now() + this.opts.claimTimeoutMs;
    let asked = false;
    for (;;) {
      const stored = (await this.db.select({ fence: robots.fence }).from(robots).where(eq(robots.id, robotId)).limit(1))[0];
      if (!stored) throw new TesseraError("not_found", "robot", `There is no robot ${robotId} on the roster.`);
      const fence = await this.leases.acquire(robotId, stored.fence);
      if (fence !== null) {
        await this.takeOver(robotId, fence);
        return;
      }
      const holder = await this.leases.holder(robotId);
      if (holder?.nodeId === this.nodeId && !this.held.has(robotId)) {
        // Left by an earlier run of this node under the same id: nobody serves it.
        await this.leases.release(robotId, holder.fence);
        continue;
      }
      if (holder && !asked) {
        asked = true;
        await this.opts.askHandover(robotId);
        continue;
      }
      if (Date.now() > deadline) {
        throw new TesseraError("unavailable", "robot", `Robot ${robotId} is still served by node ${holder?.nodeId ?? "(unknown)"}; try again.`);
      }
      await sleep(150);
    }
  }

  private async takeOver(robotId: string, fence: number): Promise<void> {
    this.held.set(robotId, { fence, confirmedAt: Date.now() });
    try {
      // Waits for a batch of the previous owner that holds the row, and refuses all its later ones.
      await checkFences(this.db, [robotId], this.fenceOf);
      const row = (await this.db.select().from(robots).where(eq(robots.id, robotId)).limit(1))[0];
      if (!row) throw new TesseraError("not_found", "robot", `There is no robot ${robotId} on the roster.`);
      const runtime = await this.fleet.load(row);
      this.parked.delete(robotId);
      logger.info({ robot: robotId, fence, node: this.nodeId }, "robot taken over");
      this.fleet.publish(runtime);
    } catch (err) {
      this.held.delete(robotId);
      await this.leases.release(robotId, fence).catch(() => {});
      throw err;
    }
  }

  /** Another node asks for the robot: stop serving it, store what is queued, give up the lease. True when it was ours. */
  async handOver(robotId: string): Promise<boolean> {
    if (!this.held.has(robotId)) return false;
    await this.park(robotId, "handed over");
    return true;
  }

  /**
   * Stops serving a robot. Its link is closed first, so the robot reconnects (through the
   * balancer) to whichever node serves it next; what it sent is committed before the lease goes.
   */
  private async park(robotId: string, why: string): Promise<void> {
    const runtime = this.fleet.robots.get(robotId);
    const entry = this.held.get(robotId);
    if (runtime) {
      const socket = runtime.socket;
      runtime.socket = null;
      socket?.disconnect(true);
      await runtime.chain;
      await this.fleet.writer.flush().catch((err: unknown) => logger.warn({ err, robot: robotId }, "last writes of a parked robot failed"));
      this.parked.set(robotId, this.fleet.frame(runtime));
      this.fleet.robots.delete(robotId);
    }
    this.held.delete(robotId);
    if (entry) await this.leases.release(robotId, entry.fence).catch(() => {});
    logger.info({ robot: robotId, node: this.nodeId, why }, "robot no longer served here");
  }

  /** Runtimes the Fleet holds without a lease (loaded at start, registered or rebuilt here) become parked frames. */
  private sweep(): void {
    for (const [id, runtime] of this.fleet.robots) {
      if (this.held.has(id) || this.claiming.has(id)) continue;
      if (!this.parked.has(id)) this.parked.set(id, this.fleet.frame(runtime));
      this.fleet.robots.delete(id);
    }
  }

  private async renewAll(): Promise<void> {
    if (this.renewing) return;
    this.renewing = true;
    try {
      const ttl = this.leases.ttlMs;
      await Promise.all(
        [...this.held].map(async ([id, entry]) => {
          let lost: boolean;
          try {
            lost = !(await this.leases.renew(id, entry.fence));
            if (!lost) entry.confirmedAt = Date.now();
          } catch (err) {
            // Without Redis the lease may still be ours; past its TTL it is not, whatever Redis says later.
            lost = Date.now() - entry.confirmedAt > ttl;
            if (lost) logger.warn({ err, robot: id }, "lease could not be renewed before it expired");
          }
          if (lost && this.held.get(id) === entry) await this.park(id, "lease lost");
        }),
      );
      this.sweep();
    } finally {
      this.renewing = false;
    }
  }

  /** Commits what is queued and gives every lease up, so other nodes take the robots over at once. */
  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    await Promise.all([...this.held.keys()].map((id) => this.park(id, "node stopping")));
  }
}
