/**
 * Policies per (floorplan version, goal tile, motion model): answered from memory, then
 * from the policies table, else solved — in a worker thread for large plans, so the
 * event loop keeps serving other robots — and stored for next time.
 */
import { createHash } from "node:crypto";
import { Worker } from "node:worker_threads";
import { and, eq } from "drizzle-orm";
import type { Db } from "../../db/client";
import { policies } from "../../db/schema";
import type { Floorplan, Tile } from "../../lib/floorplan";
import type { MotionModel } from "../../lib/motion";
import { planPolicy, type Policy } from "../../lib/planning";
import { logger } from "../logger";

const MEMORY_ENTRIES = 64;
/** Largest policy row written to the policies table (value + action bytes). */
const MAX_STORED_POLICY_BYTES = 6 * 1024 * 1024;

export function motionModelHash(model: MotionModel): string {
  return createHash("sha256").update(JSON.stringify(model)).digest("hex");
}

export interface PolicyRequest {
  versionId: number;
  plan: Floorplan;
  goal: Tile;
  model: MotionModel;
}

function toBuffer(array: Float64Array | Uint8Array): Buffer {
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength);
}

// Node 20 does not carry the process's `--import tsx` hooks into worker threads (the worker
// failed with "Unknown file extension .ts"), so the worker registers tsx itself, then loads the module.
const WORKER_BOOTSTRAP = [
  `import { register } from ${JSON.stringify(import.meta.resolve("tsx/esm/api"))};`,
  "register();",
  `await import(${JSON.stringify(new URL("./policy-worker.ts", import.meta.url).href)});`,
].join("\n");

function solveInWorker(plan: Floorplan, goal: Tile, model: MotionModel): Promise<Policy> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(WORKER_BOOTSTRAP, { eval: true, workerData: { plan, goal, model } });
    worker.once("message", (msg: Pick<Policy, "value" | "action" | "sweeps" | "converged">) => {
      resolve({ ...msg, goal, model });
      void worker.terminate();
    });
    worker.once("error", reject);
    worker.once("exit", (code) => {
      if (code !== 0) reject(new Error(`policy worker exited with code ${code}`));
    });
  });
}

export class PolicyCache {
  private readonly memory = new Map<string, Promise<Policy>>();
  readonly stats = { memoryHits: 0, dbHits: 0, solved: 0 };

  constructor(
    private readonly db: Db,
    private readonly workerTiles: number,
  ) {}

  /** The policy for the request; concurrent requests for one key share one solve. */
  get(req: PolicyRequest): Promise<Policy> {
    const modelHash = motionModelHash(req.model);
    const key = `${req.versionId}:${req.goal.row},${req.goal.col}:${modelHash}`;
    const cached = this.memory.get(key);
    if (cached) {
      this.stats.memoryHits += 1;
      this.memory.delete(key);
      this.memory.set(key, cached);
      return cached;
    }
    const pending = this.load(req, modelHash);
    this.memory.set(key, pending);
    pending.catch(() => this.memory.delete(key));
    while (this.memory.size > MEMORY_ENTRIES) this.memory.delete(this.memory.keys().next().value as string);
    return pending;
  }

  /** Solves without storing: for temporary plans (a tile taken by a blocking robot). */
  solveTransient(plan: Floorplan, goal: Tile, model: MotionModel): Promise<Policy> {
    return plan.rows * plan.cols > this.workerTiles ? solveInWorker(plan, goal, model) : Promise.resolve(planPolicy(plan, goal, model));
  }

  private async load(req: PolicyRequest, modelHash: string): Promise<Policy> {
    const where = and(
      eq(policies.versionId, req.versionId),
      eq(policies.goalRow, req.goal.row),
      eq(policies.goalCol, req.goal.col),
      eq(policies.modelHash, modelHash),
    );
    const rows = await this.db.select().from(policies).where(where).limit(1);
    const stored = rows[0];
    if (stored) {
      this.stats.dbHits += 1;
      const value = new Float64Array(stored.value.buffer.slice(stored.value.byteOffset, stored.value.byteOffset + stored.value.byteLength));
      return { value, action: new Uint8Array(stored.action), goal: req.goal, model: req.model, sweeps: 0, converged: true };
    }
    const started = performance.now();
    const policy = await this.solveTransient(req.plan, req.goal, req.model);
    const computeMs = Math.round(performance.now() - started);
    this.stats.solved += 1;
    const bytes = policy.value.byteLength + policy.action.byteLength;
    // The table is a cache: a policy that is not stored is still the right answer, solved again
    // next time. Rows over the limit are not sent at all: escaped, they would pass MariaDB's
    // default max_allowed_packet (16 MB), and the refused packet also costs the pooled connection.
    if (bytes > MAX_STORED_POLICY_BYTES) {
      logger.warn({ versionId: req.versionId, goal: req.goal, bytes, limit: MAX_STORED_POLICY_BYTES }, "policy too large to store; kept in memory only");
      return policy;
    }
    await this.db
      .insert(policies)
      .ignore()
      .values({
        versionId: req.versionId,
        goalRow: req.goal.row,
        goalCol: req.goal.col,
        modelHash,
        value: toBuffer(policy.value),
        action: toBuffer(policy.action),
        computeMs,
      })
      .catch((err: unknown) => logger.warn({ err, versionId: req.versionId, goal: req.goal, bytes }, "policy solved but not stored"));
    return policy;
  }
}
