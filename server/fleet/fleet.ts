/**
 * The fleet service: every robot's belief, link state, mission, holds and traffic, in
 * memory; every message and command stored through the batched writer; frames for the
 * dashboards as events. One instance per process, owning the robots connected to it.
 */
import { EventEmitter } from "node:events";
import { and, desc, eq, gt, inArray, isNull, max, ne, sql } from "drizzle-orm";
import type { Socket } from "socket.io";
import type { Db } from "../../db/client";
import { planFromVersion, defaultFloorplanId, latestVersion, versionById } from "../../db/queries/floorplans";
import { alerts, audit, beliefs, events, missions, robots, type Robot } from "../../db/schema";
import { tileMarginal } from "../../lib/belief";
import { isFreeTile, stateIndex, type Floorplan, type Tile } from "../../lib/floorplan";
import { actionCarriedOut } from "../../lib/motion";
import { chooseAction, dualModeState, giveWayTile, onRoute } from "../../lib/planning";
import { resolveRobotSettings, type RobotSettings } from "../../lib/roster";
import {
  MAX_MESSAGE_BYTES,
  ROBOT_EVENTS,
  type Ack,
  type Beat,
  type Hello,
  type Moved,
  type RobotEventName,
  type Sensed,
  type SimFaultMessage,
  type Truth,
  type FloorplanVersionFrame,
  type RobotFrame,
  type ServerMessage,
} from "../../lib/protocol";
import type { SensorReading, SensorSpec } from "../../lib/sensing";
import { ACTIONS, NO_ACTION, type AckCode, type AlertKind, type Heading, type HoldReason, type MissionOutcome } from "../../lib/vocabulary";
import type { FleetConfig } from "../config";
import { TesseraError } from "../errors";
import { logger } from "../logger";
import { PolicyCache } from "./policy-cache";
import { likelyTile, missionRoute } from "./route-preview";
import { MODELS_EVENT } from "./models-at";
import { applyToFilter, FILTER_EVENT_KINDS } from "./filter-events";
import { missionRef, robotFrame, robotState } from "./frames";
import { RobotRuntime, type MissionRuntime } from "./robot-runtime";
import { StorageWatch } from "./storage-watch";
import { occupiedTiles, peerOfRuntime, trafficBlocker, type TrafficPeer } from "./traffic";
import { FleetWriter } from "./writer";

/** Who asked for a command: a signed-in user, or the server itself (demo scheduler). */
export interface Actor {
  userId: number | null;
  label: string;
}

type AckFn = (ack: Ack) => void;

/**
 * After a hello (or a release from a storage hold) the mission resumes this much later, so
 * the messages the robot resends come first; then a step it never received is sent again.
 */
const RESUME_AFTER_MS = 300;

function refuse(seq: number | null, code: AckCode, message: string): Ack {
  return { ok: false, seq, code, message };
}

/** A copy of `plan` with `tile` blocked, to plan round a robot standing there. */
function withBlockedTile(plan: Floorplan, tile: Tile): Floorplan {
  const blocked = Uint8Array.from(plan.blocked);
  blocked[tile.row * plan.cols + tile.col] = 1;
  return { ...plan, blocked };
}

function describeIssue(issue: { path: PropertyKey[]; message: string }): string {
  const where = issue.path.length ? issue.path.map(String).join(".") : "message";
  return `${where}: ${issue.message}`;
}

export interface FleetEvents {
  robot: [RobotFrame];
  belief: [{ robotId: string; floorplanId: number | null; rows: number; cols: number; marginal: Float32Array }];
  alert: [{ id: number; robotId: string | null; kind: AlertKind; message: string; createdAt: number; floorplanId: number | null }];
  /** A robot left the live floor (retired). */
  removed: [{ robotId: string; floorplanId: number | null }];
  /** A new version of a floorplan was saved. */
  floorplan: [FloorplanVersionFrame];
}

export class Fleet extends EventEmitter<FleetEvents> {
  readonly robots = new Map<string, RobotRuntime>();
  readonly writer: FleetWriter;
  readonly policies: PolicyCache;
  readonly storage: StorageWatch;
  private readonly plans = new Map<number, Floorplan>();
  private watchdog: NodeJS.Timeout | undefined;
  /** With several nodes: the robots the other nodes serve, for the traffic rule (server/cluster/traffic-peers.ts). */
  remotePeers: (() => Iterable<TrafficPeer>) | undefined;

  constructor(
    readonly db: Db,
    readonly config: FleetConfig,
  ) {
    super();
    this.writer = new FleetWriter(db, config.writeTickMs);
    this.policies = new PolicyCache(db, config.workerTiles);
    this.storage = new StorageWatch({ probe: () => this.db.execute(sql`SELECT 1`), restore: () => this.storageBack() });
  }

  /** Loads every robot of the roster and rebuilds its belief and mission from the database. */
  async start(): Promise<void> {
    const rows = await this.db.select().from(robots).where(isNull(robots.retiredAt));
    for (const row of rows) await this.load(row);
    this.watchdog = setInterval(() => this.tick(), 250);
    this.watchdog.unref();
    logger.info({ robots: this.robots.size }, "fleet service started");
  }

  async stop(): Promise<void> {
    if (this.watchdog) clearInterval(this.watchdog);
    this.storage.stop();
    await Promise.all([...this.robots.values()].map((r) => r.chain));
    await this.writer.flush();
  }

  /** The floorplan of a version, cached per process (versions are immutable). */
  async planOf(versionId: number): Promise<Floorplan> {
    const cached = this.plans.get(versionId);
    if (cached) return cached;
    const row = await versionById(this.db, versionId);
    if (!row) throw new Error(`floorplan version ${versionId} does not exist`);
    const plan = planFromVersion(row);
    this.plans.set(versionId, plan);
    return plan;
  }

  /** Creates (or re-creates) a robot's runtime from its row, snapshot and later events. */
  async load(row: Robot): Promise<RobotRuntime> {
    const floorplanId = row.floorplanId ?? (await defaultFloorplanId(this.db)) ?? null;
    if (floorplanId === null) throw new Error(`robot ${row.id} has no floorplan and there is no default one`);
    const active = (await this.db.select().from(missions).where(and(eq(missions.robotId, row.id), eq(missions.state, "active"))).limit(1))[0];
    const snapshot = (await this.db.select().from(beliefs).where(eq(beliefs.robotId, row.id)).orderBy(desc(beliefs.eventId)).limit(1))[0];
    const versionId = active?.versionId ?? snapshot?.versionId ?? (await latestVersion(this.db, floorplanId))?.id;
    if (versionId === undefined) throw new Error(`floorplan ${floorplanId} has no version`);
    const plan = await this.planOf(versionId);
    const { settings } = resolveRobotSettings(row.drive, row.settings);
    const runtime = new RobotRuntime(row.id, row.name, row.simulated, row.drive, floorplanId, versionId, plan, row.sensors as SensorSpec[], settings);
    const usable = snapshot && snapshot.versionId === versionId;
    if (usable) {
      runtime.reset(new Float64Array(snapshot.belief.buffer.slice(snapshot.belief.byteOffset, snapshot.belief.byteOffset + snapshot.belief.byteLength)));
      runtime.lastFilterEvent = snapshot.eventId;
    }
    const after = usable ? snapshot.eventId : 0;
    const later = await this.db
      .select()
      .from(events)
      .where(and(eq(events.robotId, row.id), gt(events.id, after), inArray(events.kind, [...FILTER_EVENT_KINDS])))
      .orderBy(events.id);
    for (const e of later) {
      applyToFilter(runtime, e.kind, e.payload as Record<string, unknown>);
      runtime.lastFilterEvent = e.id;
    }
    const [{ last }] = await this.db.select({ last: max(events.seq) }).from(events).where(eq(events.robotId, row.id));
    runtime.lastSeq = Number(last ?? 0);
    const [{ lastOrdered }] = await this.db
      .select({ lastOrdered: max(events.seq) })
      .from(events)
      .where(and(eq(events.robotId, row.id), eq(events.source, "robot"), ne(events.kind, "hello")));
    runtime.orderSeq = Number(lastOrdered ?? 0);
    const lastTune = (
      await this.db
        .select({ payload: events.payload })
        .from(events)
        .where(and(eq(events.robotId, row.id), eq(events.source, "server"), eq(events.kind, "tune")))
        .orderBy(desc(events.id))
        .limit(1)
    )[0];
    runtime.tuned = (lastTune?.payload as { pid?: RobotRuntime["tuned"] } | undefined)?.pid ?? null;
    if (active) {
      const policy = await this.policies.get({ versionId, plan, goal: { row: active.goalRow, col: active.goalCol }, model: runtime.motion });
      runtime.mission = newMission(active.id, { row: active.goalRow, col: active.goalCol }, versionId, policy, active.steps, active.holds);
    }
    if (!usable) {
      runtime.sinceSnapshot = this.config.snapshotEvery;
    }
    this.robots.set(row.id, runtime);
    return runtime;
  }

  /** After a failed write the in-memory state ran ahead of the log: rebuild it from what was stored. */
  private async recover(stale: RobotRuntime): Promise<RobotRuntime | null> {
    const row = (await this.db.select().from(robots).where(eq(robots.id, stale.id)).limit(1))[0];
    if (!row) return null;
    const fresh = await this.load(row);
    fresh.socket = stale.socket;
    fresh.online = stale.online;
    fresh.lastMessageAt = stale.lastMessageAt;
    fresh.battery = stale.battery;
    fresh.hold = stale.hold;
    fresh.certaintyHistory = stale.certaintyHistory;
    fresh.lastOutcome = stale.lastOutcome;
    fresh.lastTruth = stale.lastTruth;
    this.publish(fresh);
    return fresh;
  }

  /**
   * Any failed write: when storage is down the robot is held until it returns (and rebuilt
   * then, with every other robot); otherwise it is rebuilt now. Never rejects.
   */
  private async failed(runtime: RobotRuntime, err: unknown, what: string): Promise<void> {
    if (await this.storage.check(err)) {
      this.holdUnstored(runtime);
      return;
    }
    logger.error({ err, robot: runtime.id, what }, "write failed; rebuilding the robot from the database");
    await this.recover(runtime).catch((e: unknown) => logger.error({ err: e, robot: runtime.id }, "robot rebuild failed"));
  }

  /** A message while storage is down: refused, never applied nor queued; the robot resends it later. */
  private refuseUnstored(runtime: RobotRuntime, raw: unknown): Ack {
    // The link is alive, only storage is not: the heartbeat watchdog must not call the robot offline.
    runtime.lastMessageAt = Date.now();
    this.holdUnstored(runtime);
    return refuse(seqOf(raw), "internal", "The server cannot store messages right now; send it again.");
  }

  /**
   * Holds a robot whose messages cannot be stored, once per outage. Nothing is written
   * now; the hold's log entry and alert are written by `storageBack`.
   */
  private holdUnstored(runtime: RobotRuntime): void {
    if (this.storage.held.has(runtime.id)) return;
    this.storage.held.set(runtime.id, { since: Date.now(), previous: runtime.hold });
    runtime.hold = "fault";
    runtime.socket?.emit("hold", { reason: "fault", ...(runtime.mission ? { mission: runtime.mission.id } : {}) });
    logger.warn({ robot: runtime.id }, "robot held: its messages cannot be stored");
    this.publish(runtime);
  }

  /**
   * Storage answers again. Every robot is rebuilt from the database (any of them may have
   * run ahead of a write that failed). The holds of the outage go into the log after the
   * last event stored before it, which is where they happened, and are then lifted: the
   * robots' resent messages follow and the missions go on. Throws when storage fails
   * again before the log is written; the watch then retries from the start.
   */
  private async storageBack(): Promise<void> {
    for (const stale of [...this.robots.values()]) {
      await stale.chain;
      if (this.robots.get(stale.id) === stale) await this.recover(stale);
    }
    const lifted: RobotRuntime[] = [];
    for (const [robotId, hold] of this.storage.held) {
      const runtime = this.robots.get(robotId);
      if (!runtime) continue;
      const missionId = runtime.mission?.id ?? null;
      const keep = hold.previous === "operator" || hold.previous === "low_certainty" ? hold.previous : null;
      const heldFor = Math.round((Date.now() - hold.since) / 1000);
      const entry = { robotId, seq: null, missionId, source: "server" as const, robotAt: null };
      this.writer.event({ ...entry, kind: "hold", payload: { reason: "fault", why: "storage unavailable", ...(missionId ? { mission: missionId } : {}) }, receivedAt: new Date(hold.since) });
      if (!keep) this.writer.event({ ...entry, kind: "release", payload: { reason: "storage back", heldS: heldFor }, receivedAt: new Date() });
      if (runtime.mission) {
        runtime.mission.holds += 1;
        this.writer.mission(runtime.mission.id, { holds: runtime.mission.holds });
      }
      runtime.hold = keep;
      if (!keep) lifted.push(runtime);
    }
    await this.writer.commit();
    const now = Date.now();
    for (const runtime of lifted) {
      runtime.socket?.emit("release", runtime.mission ? { mission: runtime.mission.id } : {});
      if (runtime.socket?.connected) runtime.lastMessageAt = now;
      runtime.resumeAt = now + RESUME_AFTER_MS;
      this.publish(runtime);
      this.publishBelief(runtime);
    }
    for (const [robotId, hold] of this.storage.held) {
      const runtime = this.robots.get(robotId);
      if (runtime) void this.alert(runtime, "fault", `${runtime.name} held for ${Math.round((now - hold.since) / 1000)} s: the database was unavailable, so its messages could not be stored`);
    }
  }

  private runtime(robotId: string): RobotRuntime {
    const runtime = this.robots.get(robotId);
    if (!runtime) throw new TesseraError("not_found", "robot", `There is no active robot ${robotId}.`);
    return runtime;
  }

  /** Adds a robot registered while the server runs. */
  async register(row: Robot): Promise<void> {
    const runtime = await this.load(row);
    this.publish(runtime);
  }

  // ——— the robot link ———

  attach(robotId: string, socket: Socket): void {
    const runtime = this.runtime(robotId);
    const old = runtime.socket;
    if (old && old.id !== socket.id && old.connected) {
      old.emit("replaced", {});
      old.disconnect(true);
    }
    runtime.socket = socket;
  }

  isConnected(robotId: string): boolean {
    return Boolean(this.robots.get(robotId)?.socket?.connected);
  }

  detach(robotId: string, socket: Socket): void {
    const runtime = this.robots.get(robotId);
    if (runtime && runtime.socket?.id === socket.id) runtime.socket = null;
  }

  /** Handles one robot → server event; answers through `ack` only after the event is stored. */
  receive(robotId: string, event: string, raw: unknown, ack: AckFn): void {
    const runtime = this.robots.get(robotId);
    if (!runtime) {
      ack(refuse(null, "internal", `robot ${robotId} is not loaded`));
      return;
    }
    if (this.storage.down) {
      ack(this.refuseUnstored(runtime, raw));
      return;
    }
    runtime.chain = runtime.chain
      .then(() => (this.storage.down ? this.refuseUnstored(runtime, raw) : this.apply(runtime, event, raw)))
      .then(ack, async (err: unknown) => {
        ack(refuse(seqOf(raw), "internal", "The server could not store this message; send it again."));
        await this.failed(runtime, err, event);
      });
  }

  /** Counts a refusal; true when the robot has now exceeded the too-many-errors rule. */
  private countError(runtime: RobotRuntime): boolean {
    const now = Date.now();
    runtime.errors = runtime.errors.filter((t) => now - t < this.config.errorWindowMs);
    runtime.errors.push(now);
    return runtime.errors.length >= this.config.maxErrors;
  }

  private refused(runtime: RobotRuntime, ack: Ack): Ack {
    if (this.countError(runtime) && runtime.socket) {
      const socket = runtime.socket;
      logger.warn({ robot: runtime.id }, "too many refused messages; closing the link");
      socket.emit("too_many_errors", { reason: "too_many_errors" });
      setTimeout(() => socket.disconnect(true), 10);
    }
    return ack;
  }

  private async apply(runtime: RobotRuntime, event: string, raw: unknown): Promise<Ack> {
    const seq = seqOf(raw);
    let size: number;
    try {
      size = Buffer.byteLength(JSON.stringify(raw ?? null));
    } catch {
      return this.refused(runtime, refuse(seq, "bad_message", "message: not serialisable JSON"));
    }
    if (size > MAX_MESSAGE_BYTES) return this.refused(runtime, refuse(seq, "too_large", `message is ${size} bytes; the limit is ${MAX_MESSAGE_BYTES}`));
    if (!(event in ROBOT_EVENTS)) return this.refused(runtime, refuse(seq, "bad_message", `event: unknown event "${event}"`));
    const name = event as RobotEventName;
    const parsed = ROBOT_EVENTS[name].safeParse(raw);
    if (!parsed.success) return this.refused(runtime, refuse(seq, "bad_message", describeIssue(parsed.error.issues[0])));
    const msg = parsed.data;
    runtime.lastMessageAt = Date.now();

    // A hello is the resync point and comes first after a reconnect, ahead of the resent
    // messages with lower seqs; so only non-hello messages set the order barrier.
    if (msg.seq <= runtime.lastSeq) {
      const seen = await this.db
        .select({ id: events.id })
        .from(events)
        .where(and(eq(events.robotId, runtime.id), eq(events.seq, msg.seq)))
        .limit(1);
      if (name === "hello") {
        // A robot that reconnects with messages still waiting keeps its hello's seq, so a
        // repeated hello is the usual resync after a dropped link, and the mission resumes as after any other.
        this.comeOnline(runtime);
        this.retune(runtime);
        runtime.resumeAt = Date.now() + RESUME_AFTER_MS;
        const state = { lastSeq: runtime.lastSeq, state: robotState(runtime), mission: missionRef(runtime) };
        if (seen.length) return { ok: true, seq: msg.seq, dup: true, ...state };
        return { ...refuse(msg.seq, "out_of_order", `seq ${msg.seq} is below the last applied seq ${runtime.lastSeq}; continue from ${runtime.lastSeq + 1}`), lastSeq: runtime.lastSeq, state: state.state };
      }
      if (seen.length) return { ok: true, seq: msg.seq, dup: true };
      if (msg.seq <= runtime.orderSeq) {
        return this.refused(runtime, refuse(msg.seq, "out_of_order", `seq ${msg.seq} was never applied and is below the last applied seq ${runtime.orderSeq}`));
      }
    }

    if (name === "truth" && !runtime.simulated) return this.refused(runtime, refuse(msg.seq, "bad_message", "truth: accepted only from simulated robots"));
    // A move that finishes just after its mission ended (done, cancel) still happened and is fused.
    const recentlyEnded = runtime.lastOutcome !== null && Date.now() - runtime.lastOutcome.at < 30_000;
    if (name === "moved" && !runtime.mission && !recentlyEnded) return this.refused(runtime, refuse(msg.seq, "no_mission", "moved: the robot has no active mission"));

    const payload = { ...(msg as Record<string, unknown>) };
    delete payload.seq;
    delete payload.at;
    const queued = this.writer.event({
      robotId: runtime.id,
      seq: msg.seq,
      missionId: runtime.mission?.id ?? null,
      source: "robot",
      kind: name,
      payload,
      robotAt: msg.at,
      receivedAt: new Date(),
    });
    runtime.lastSeq = Math.max(runtime.lastSeq, msg.seq);
    if (name !== "hello") runtime.orderSeq = msg.seq;
    const after: (() => void)[] = [];

    switch (name) {
      case "hello": {
        const hello = msg as Hello;
        runtime.drive = hello.drive;
        if (JSON.stringify(hello.sensors) !== JSON.stringify(runtime.sensors)) {
          runtime.setSensors(hello.sensors);
          this.db
            .update(robots)
            .set({ sensors: hello.sensors })
            .where(eq(robots.id, runtime.id))
            .catch((err: unknown) => logger.error({ err, robot: runtime.id }, "the robot's new sensor set could not be stored"));
        }
        this.comeOnline(runtime);
        after.push(() => this.retune(runtime));
        break;
      }
      case "beat": {
        const beat = msg as Beat;
        runtime.battery = beat.battery;
        const wasFault = runtime.fault;
        runtime.fault = beat.status === "fault" ? (beat.fault ?? "fault") : null;
        if (runtime.fault && !wasFault) after.push(() => this.placeHold(runtime, "fault", `reports a fault: ${runtime.fault}`));
        if (!runtime.fault && wasFault && runtime.hold === "fault") after.push(() => this.lift(runtime, { userId: null, label: "robot" }));
        if (!runtime.online) this.comeOnline(runtime);
        break;
      }
      case "moved": {
        const moved = msg as Moved;
        applyToFilter(runtime, "moved", moved);
        if (runtime.mission) {
          const didNotMove = moved.action !== "stay" && actionCarriedOut(moved.action, moved.odometry, runtime.plan.tileM) === "stay";
          runtime.mission.stuckMoves = didNotMove ? runtime.mission.stuckMoves + 1 : 0;
          if (runtime.mission.awaiting !== "moved") {
            // A move whose `next` this server never stored: the node that sent it died before
            // its batch was committed, so the rebuilt mission is a step short. Count the step,
            // or the next one would reuse a number the robot has carried out and so ignores.
            runtime.mission.step += 1;
            this.writer.mission(runtime.mission.id, { steps: runtime.mission.step });
          }
          runtime.mission.awaiting = "sensed";
        }
        runtime.lastFilterEvent = queued;
        break;
      }
      case "sensed": {
        const sensed = msg as Sensed;
        const outcome = runtime.sense(sensed.readings as SensorReading[]);
        if (outcome.fellBack) logger.info({ robot: runtime.id, seq: msg.seq }, "no state explains these readings; fell back to the mixing floor");
        runtime.lastFilterEvent = queued;
        runtime.sinceSnapshot += 1;
        const c = runtime.certainty();
        runtime.recordCertainty(c.tileMass);
        if (runtime.mission) {
          runtime.mission.minCertainty = Math.min(runtime.mission.minCertainty, c.tileMass);
          this.writer.mission(runtime.mission.id, { minCertainty: c.tileMass });
          // A reading that is not the answer to a move (an idle one that crossed the `next` on
          // the wire) is fused, but the step stays outstanding: answering it with another
          // `next` would leave the robot one action behind every later choice.
          if (runtime.mission.awaiting !== "moved") {
            runtime.mission.claim = null;
            const step = runtime.mission.awaiting === "sensed";
            runtime.mission.awaiting = null;
            after.push(() => void this.advance(runtime, step).catch((err: unknown) => this.failed(runtime, err, "advance")));
          }
        }
        if (runtime.sinceSnapshot >= this.config.snapshotEvery) this.snapshot(runtime);
        after.push(() => this.publishBelief(runtime));
        break;
      }
      case "truth": {
        const truth = msg as Truth;
        runtime.lastTruth = { row: truth.row, col: truth.col, heading: truth.heading };
        break;
      }
    }

    await this.writer.commit();
    for (const fn of after) fn();
    this.publish(runtime);
    if (name === "hello") {
      runtime.resumeAt = Date.now() + RESUME_AFTER_MS;
      return { ok: true, seq: msg.seq, lastSeq: runtime.lastSeq, state: robotState(runtime), mission: missionRef(runtime) };
    }
    return { ok: true, seq: msg.seq };
  }

  private comeOnline(runtime: RobotRuntime): void {
    runtime.online = true;
    runtime.lastMessageAt = Date.now();
    if (runtime.hold === "offline") {
      runtime.hold = null;
      this.logCommand(runtime, "server", "release", { reason: "back online" });
      if (runtime.socket) runtime.socket.emit("release", runtime.mission ? { mission: runtime.mission.id } : {});
    }
  }

  /** After a hello: the gains last pushed, which a rebooted robot has forgotten. */
  private retune(runtime: RobotRuntime): void {
    if (runtime.tuned) this.command(runtime, "tune", { pid: runtime.tuned });
  }

  private snapshot(runtime: RobotRuntime): void {
    const c = runtime.certainty();
    this.writer.snapshot({
      robotId: runtime.id,
      after: runtime.lastFilterEvent,
      missionId: runtime.mission?.id ?? null,
      versionId: runtime.versionId,
      belief: runtime.filter.belief,
      tileMass: c.tileMass,
      entropy: c.entropy,
    });
    runtime.sinceSnapshot = 0;
  }

  /** Emits a server → robot command and logs it in the events table. */
  private command<K extends keyof ServerMessage>(runtime: RobotRuntime, name: K, payload: ServerMessage[K]): void {
    this.logCommand(runtime, "server", name, payload as Record<string, unknown>);
    runtime.socket?.emit(name, payload);
  }

  private logCommand(runtime: RobotRuntime, source: "server" | "operator", kind: string, payload: Record<string, unknown>): void {
    this.writer.event({ robotId: runtime.id, seq: null, missionId: runtime.mission?.id ?? null, source, kind, payload, robotAt: null, receivedAt: new Date() });
  }

  // ——— the step cycle ———

  /** After a sensed message (or a release): arrival, holds, traffic, then the next action. */
  private async advance(runtime: RobotRuntime, stepDone: boolean): Promise<void> {
    const mission = runtime.mission;
    if (!mission) return;
    const c = runtime.certainty();
    if (runtime.massOn(mission.goal) >= this.config.arriveMass) {
      await this.finish(runtime, "reached");
      return;
    }
    if (mission.step >= this.config.maxMissionSteps) {
      await this.finish(runtime, "failed");
      return;
    }
    if (stepDone && !runtime.hold && mission.stuckMoves >= this.config.stuckAfterMoves) {
      // A robot pushing against something the map does not show (a pallet, a person's foot)
      // must not be sent at it again and again; someone has to look before it goes on.
      this.placeHold(runtime, "fault", `its last ${mission.stuckMoves} moves did not move it (bumped or blocked); check the way before releasing it`);
      mission.stuckMoves = 0;
      return;
    }
    if (stepDone) {
      if (c.tileMass >= this.config.releaseAbove) mission.armed = true;
      mission.lowSteps = mission.armed && c.tileMass < this.config.holdBelow ? mission.lowSteps + 1 : 0;
      if (!runtime.hold && mission.lowSteps >= this.config.holdAfterSteps) {
        this.placeHold(runtime, "low_certainty", `certainty ${(c.tileMass * 100).toFixed(0)}% stayed under ${(this.config.holdBelow * 100).toFixed(0)}% for ${mission.lowSteps} steps`);
        return;
      }
    }
    if (runtime.hold === "low_certainty" && c.tileMass >= this.config.releaseAbove) {
      this.lift(runtime, { userId: null, label: "hysteresis" });
      return;
    }
    if (runtime.hold || !runtime.online || mission.awaiting) return;
    this.sendNext(runtime);
  }

  /** Chooses and sends the next action, unless the traffic rule says wait. */
  private sendNext(runtime: RobotRuntime): void {
    const mission = runtime.mission;
    if (!mission || mission.awaiting) return;
    const c = runtime.certainty();
    if (mission.giveWay) {
      if (!this.givenWay(runtime, mission, mission.giveWay.to)) {
        if (c.row === mission.giveWay.tile.row && c.col === mission.giveWay.tile.col) {
          this.waitAside(runtime);
          return;
        }
      } else {
        mission.giveWay = null;
        mission.detour = null;
        mission.detourAround = null;
      }
    } else if (mission.detourAround && !trafficBlocker(this.peers(), runtime.id, runtime.versionId, mission.detourAround, this.config.trafficMass)) {
      mission.detour = null;
      mission.detourAround = null;
    }
    const policy = mission.detour ?? mission.policy;
    // QMDP never moves just to learn, so while the belief is spread the robot acts as one
    // likely state (dual-mode control, lib/planning/dual-mode.ts).
    const guide = c.tileMass < this.config.releaseAbove ? dualModeState(runtime.plan, runtime.filter.belief, mission.goal) : -1;
    const unsure = guide >= 0 && policy.action[guide] !== NO_ACTION;
    const here = unsure ? guide : stateIndex(runtime.plan, c.row, c.col, c.heading);
    let action = unsure ? ACTIONS[policy.action[here]] : chooseAction(runtime.plan, policy, runtime.filter.belief, { table: runtime.filter.table });
    // Staying put repeats the same readings; after a few, turn in place to sense anew.
    mission.stays = action === "stay" ? mission.stays + 1 : 0;
    if (mission.stays > 2) {
      action = "left";
      mission.stays = 0;
    }
    const target = likelyTile(runtime.plan, runtime.filter.table, here, ACTIONS.indexOf(action));
    const fromTile = here >> 2;
    const moves = target.row !== Math.floor(fromTile / runtime.plan.cols) || target.col !== fromTile % runtime.plan.cols;
    if (moves) {
      const blocker = trafficBlocker(this.peers(), runtime.id, runtime.versionId, target, this.config.trafficMass);
      if (blocker) {
        this.waitForTraffic(runtime, blocker, target);
        return;
      }
    }
    if (runtime.hold === "traffic") {
      runtime.hold = null;
      mission.trafficSince = null;
      this.command(runtime, "release", { mission: mission.id });
    }
    mission.claim = moves ? target : null;
    mission.step += 1;
    mission.awaiting = "moved";
    mission.lastAction = action;
    mission.stepSentAt = Date.now();
    mission.stepResends = 0;
    this.writer.mission(mission.id, { steps: mission.step });
    this.command(runtime, "next", { mission: mission.id, step: mission.step, action });
    this.publish(runtime);
  }

  /** Sends the pending step again; the robot ignores it when it has already carried it out or is carrying it out. */
  private resendStep(runtime: RobotRuntime, mission: MissionRuntime): void {
    if (!mission.lastAction) return;
    mission.stepSentAt = Date.now();
    runtime.socket?.emit("next", { mission: mission.id, step: mission.step, action: mission.lastAction });
  }

  /** This process's robots, then those other nodes serve (a robot served here is never also a remote peer). */
  private *peers(): Iterable<TrafficPeer> {
    for (const r of this.robots.values()) yield peerOfRuntime(r);
    for (const p of this.remotePeers?.() ?? []) if (!this.robots.has(p.id)) yield p;
  }

  private waitForTraffic(runtime: RobotRuntime, blocker: TrafficPeer, tile: Tile): void {
    const mission = runtime.mission as MissionRuntime;
    const now = Date.now();
    if (runtime.hold !== "traffic") {
      runtime.hold = "traffic";
      mission.trafficSince = now;
      mission.holds += 1;
      this.writer.mission(mission.id, { holds: mission.holds });
      this.command(runtime, "hold", { reason: "traffic", mission: mission.id });
      logger.info({ robot: runtime.id, blocker: blocker.id, tile }, "traffic: waiting");
      this.publish(runtime);
      return;
    }
    if (mission.trafficSince === null || now - mission.trafficSince < this.config.trafficReplanMs) return;
    // A robot on its way round or aside is clearing this one's way: waiting for it is the plan.
    // Going round it as well would have both side-step the same way and meet again.
    if (blocker.detouring && blocker.hold !== "traffic") return;
    // Two robots waiting on each other would both detour the same way and meet again:
    // only the one with the larger id gives way; a robot blocked by a parked one, or by one
    // that is itself stepping aside, always does.
    const mutual = blocker.hold === "traffic" && blocker.hasMission && !blocker.givingWay;
    if (mutual && runtime.id < blocker.id) return;
    const waitedS = Math.round((now - mission.trafficSince) / 1000);
    if (tile.row === mission.goal.row && tile.col === mission.goal.col) {
      // No way round reaches a goal another robot stands on: say so once, and wait for it.
      mission.trafficSince = null;
      void this.alert(runtime, "traffic", `${runtime.name} waited ${waitedS} s for ${blocker.name}, which stands on its goal (${tile.row}, ${tile.col})`);
      return;
    }
    mission.trafficSince = now;
    const plan = withBlockedTile(runtime.plan, tile);
    this.policies.solveTransient(plan, mission.goal, runtime.motion).then(
      (detour) => {
        if (runtime.mission !== mission) return;
        const c = runtime.certainty();
        // A policy's value is −1 where the goal cannot be reached (lib/planning/plan-policy.ts).
        if (detour.value[stateIndex(plan, c.row, c.col, c.heading)] >= 0) {
          mission.detour = detour;
          mission.detourAround = tile;
          void this.alert(runtime, "traffic", `${runtime.name} waited ${waitedS} s for ${blocker.name}; re-planning around tile (${tile.row}, ${tile.col})`);
        } else {
          this.stepAside(runtime, mission, blocker, tile, plan, waitedS);
        }
      },
      (err: unknown) => logger.error({ err, robot: runtime.id }, "detour around traffic could not be planned"),
    );
  }

  /**
   * Every way to the goal runs through the robot in front (a one-tile doorway, a bay with one
   * way in). If this robot stands in that one's way too, it backs off to the nearest tile off
   * that robot's route and waits there until it has passed; otherwise waiting is all there is.
   */
  private stepAside(runtime: RobotRuntime, mission: MissionRuntime, blocker: TrafficPeer, tile: Tile, plan: Floorplan, waitedS: number): void {
    const c = runtime.certainty();
    const route = blocker.hasMission ? blocker.route : [];
    const others = [...this.peers()].filter((p) => p.id !== runtime.id && p.versionId === runtime.versionId);
    const aside = onRoute(route, c) ? giveWayTile(runtime.plan, c, [tile, ...others.flatMap(occupiedTiles)], route) : null;
    if (!aside) {
      void this.alert(runtime, "traffic", `${runtime.name} waited ${waitedS} s for ${blocker.name}, which stands in the only way to (${mission.goal.row}, ${mission.goal.col})`);
      return;
    }
    this.policies.solveTransient(plan, aside, runtime.motion).then(
      (back) => {
        if (runtime.mission !== mission) return;
        mission.detour = back;
        mission.detourAround = tile;
        mission.giveWay = { to: blocker.id, tile: aside };
        void this.alert(runtime, "traffic", `${runtime.name} waited ${waitedS} s for ${blocker.name} and no way round it reaches (${mission.goal.row}, ${mission.goal.col}); backing off to (${aside.row}, ${aside.col}) to let it pass`);
        this.publish(runtime);
      },
      (err: unknown) => logger.error({ err, robot: runtime.id }, "a way aside could not be planned"),
    );
  }

  /** The robot this one stepped aside for is done with its way: its mission is over, or it no longer stands on or claims a tile of this robot's own route. */
  private givenWay(runtime: RobotRuntime, mission: MissionRuntime, to: string): boolean {
    const other = [...this.peers()].find((p) => p.id === to);
    if (!other || !other.hasMission || other.versionId !== runtime.versionId) return true;
    const own = missionRoute(runtime, mission.policy);
    return !occupiedTiles(other).some((t) => onRoute(own, t));
  }

  /** Waits on the tile it stepped aside to, held for traffic, until the other robot has passed. */
  private waitAside(runtime: RobotRuntime): void {
    const mission = runtime.mission as MissionRuntime;
    if (runtime.hold === "traffic") return;
    runtime.hold = "traffic";
    mission.trafficSince = null;
    this.command(runtime, "hold", { reason: "traffic", mission: mission.id });
    this.publish(runtime);
  }

  private placeHold(runtime: RobotRuntime, reason: HoldReason, why: string): void {
    runtime.hold = reason;
    if (runtime.mission) {
      runtime.mission.holds += 1;
      this.writer.mission(runtime.mission.id, { holds: runtime.mission.holds });
    }
    this.command(runtime, "hold", { reason, ...(runtime.mission ? { mission: runtime.mission.id } : {}) });
    const kind: AlertKind = reason === "operator" ? "fault" : reason === "traffic" ? "traffic" : reason === "offline" ? "offline" : reason === "fault" ? "fault" : "low_certainty";
    if (reason !== "operator") void this.alert(runtime, kind, `${runtime.name} held: ${why}`);
    logger.info({ robot: runtime.id, reason, why }, "robot held");
    this.publish(runtime);
  }

  private lift(runtime: RobotRuntime, actor: Actor): void {
    runtime.hold = null;
    const mission = runtime.mission;
    if (mission) {
      mission.trafficSince = null;
      mission.lowSteps = 0;
      if (actor.userId !== null) mission.armed = false;
    }
    this.command(runtime, "release", mission ? { mission: mission.id } : {});
    logger.info({ robot: runtime.id, by: actor.label }, "robot released");
    if (mission && !mission.awaiting) this.sendNext(runtime);
    // A step still unanswered is sent again, so a robot held for not answering one can go on.
    else if (mission?.awaiting === "moved") {
      mission.stepResends = 0;
      this.resendStep(runtime, mission);
    }
    this.publish(runtime);
  }

  private async finish(runtime: RobotRuntime, outcome: MissionOutcome): Promise<void> {
    const mission = runtime.mission;
    if (!mission) return;
    this.command(runtime, "done", { mission: mission.id, outcome });
    this.snapshot(runtime);
    runtime.mission = null;
    if (runtime.hold === "traffic" || runtime.hold === "low_certainty") runtime.hold = null;
    runtime.lastOutcome = { outcome, at: Date.now() };
    await this.writer.commit();
    await this.db.update(missions).set({ state: outcome, endedAt: new Date() }).where(eq(missions.id, mission.id));
    logger.info({ robot: runtime.id, mission: mission.id, outcome, steps: mission.step }, "mission ended");
    if (outcome === "failed") void this.alert(runtime, "mission_failed", `${runtime.name} failed mission ${mission.id} to (${mission.goal.row}, ${mission.goal.col}) after ${mission.step} steps`, mission.id);
    await this.adoptLatestVersion(runtime);
    this.publish(runtime);
  }

  // ——— floorplan versions ———

  /**
   * A new version of a floorplan was saved: every idle robot on it moves to that version;
   * a robot under way keeps the version its mission pinned and moves when the mission ends.
   * Returns the ids of the robots that moved.
   */
  async floorplanChanged(floorplanId: number): Promise<string[]> {
    const moved: string[] = [];
    for (const runtime of this.robots.values()) {
      if (runtime.floorplanId !== floorplanId || runtime.mission) continue;
      const step = runtime.chain.then(async () => {
        if (await this.adoptLatestVersion(runtime)) moved.push(runtime.id);
      });
      runtime.chain = step.catch((err: unknown) => logger.error({ err, robot: runtime.id, floorplan: floorplanId }, "robot could not move to the new floorplan version"));
      await runtime.chain;
    }
    for (const id of moved) {
      const runtime = this.robots.get(id) as RobotRuntime;
      this.publishBelief(runtime);
      this.publish(runtime);
    }
    const latest = await latestVersion(this.db, floorplanId);
    if (latest) this.emit("floorplan", { floorplanId, versionId: latest.id, version: latest.version });
    return moved;
  }

  /** Switches an idle robot to its floorplan's latest version; true when it changed. */
  private async adoptLatestVersion(runtime: RobotRuntime): Promise<boolean> {
    if (runtime.mission || runtime.floorplanId === null) return false;
    const latest = await latestVersion(this.db, runtime.floorplanId);
    if (!latest || latest.id === runtime.versionId) return false;
    const from = runtime.versionId;
    runtime.switchPlan(latest.id, await this.planOf(latest.id));
    // The snapshot records the new version, so a restart loads the robot onto it.
    this.snapshot(runtime);
    await this.writer.commit();
    logger.info({ robot: runtime.id, floorplan: runtime.floorplanId, from, to: latest.id }, "robot moved to a new floorplan version");
    return true;
  }

  // ——— commands from dashboards and routes ———

  async dispatch(robotId: string, goal: Tile, actor: Actor): Promise<{ id: number; robotId: string; goal: Tile; versionId: number; state: "active" }> {
    const runtime = this.runtime(robotId);
    const plan = runtime.plan;
    const where = `Goal tile (${goal.row}, ${goal.col})`;
    if (goal.row < 0 || goal.row >= plan.rows || goal.col < 0 || goal.col >= plan.cols) throw new TesseraError("unprocessable", "dispatch", `${where} is outside the ${plan.rows} × ${plan.cols} floorplan.`);
    if (!isFreeTile(plan, goal.row, goal.col)) throw new TesseraError("unprocessable", "dispatch", `${where} is blocked.`);
    if (plan.nogo[goal.row * plan.cols + goal.col]) throw new TesseraError("unprocessable", "dispatch", `${where} is a no-go tile.`);
    if (!runtime.online) throw new TesseraError("unprocessable", "dispatch", `${runtime.name} is offline.`);
    if (runtime.mission) throw new TesseraError("unprocessable", "dispatch", `${runtime.name} is busy with mission ${runtime.mission.id}; cancel it first.`);
    const policy = await this.policies.get({ versionId: runtime.versionId, plan, goal, model: runtime.motion });
    const c = runtime.certainty();
    const here = stateIndex(plan, c.row, c.col, c.heading);
    if (policy.value[here] < 0) throw new TesseraError("unprocessable", "dispatch", `${where} cannot be reached from ${runtime.name}'s most likely pose (${c.row}, ${c.col}).`);
    if (runtime.mission) throw new TesseraError("unprocessable", "dispatch", `${runtime.name} was given another mission meanwhile.`);
    const [{ id }] = await this.db
      .insert(missions)
      .values({ robotId, versionId: runtime.versionId, goalRow: goal.row, goalCol: goal.col, createdBy: actor.userId, minCertainty: c.tileMass })
      .$returningId();
    runtime.mission = newMission(id, goal, runtime.versionId, policy, 0, 0);
    runtime.mission.armed = c.tileMass >= this.config.releaseAbove;
    runtime.lastOutcome = null;
    // The belief the mission starts from: replay's step 0.
    this.snapshot(runtime);
    this.logCommand(runtime, "operator", "dispatch", { goal, by: actor.label });
    await this.audit(actor, "dispatch", robotId, { mission: id, goal });
    if (!runtime.hold) this.sendNext(runtime);
    this.publish(runtime);
    return { id, robotId, goal, versionId: runtime.versionId, state: "active" };
  }

  async cancel(robotId: string, actor: Actor): Promise<void> {
    const runtime = this.runtime(robotId);
    if (!runtime.mission) throw new TesseraError("unprocessable", "cancel", `${runtime.name} has no mission to cancel.`);
    this.logCommand(runtime, "operator", "cancel", { by: actor.label });
    await this.audit(actor, "cancel", robotId, { mission: runtime.mission.id });
    await this.finish(runtime, "aborted");
  }

  async holdRobot(robotId: string, actor: Actor): Promise<void> {
    const runtime = this.runtime(robotId);
    this.logCommand(runtime, "operator", "hold", { by: actor.label });
    await this.audit(actor, "hold", robotId, {});
    this.placeHold(runtime, "operator", `held by ${actor.label}`);
    await this.writer.commit();
  }

  async release(robotId: string, actor: Actor): Promise<void> {
    const runtime = this.runtime(robotId);
    if (!runtime.hold) throw new TesseraError("unprocessable", "release", `${runtime.name} is not held.`);
    if (runtime.hold === "offline") throw new TesseraError("unprocessable", "release", `${runtime.name} is offline; it is released when it reconnects.`);
    this.logCommand(runtime, "operator", "release", { by: actor.label, reason: runtime.hold });
    await this.audit(actor, "release", robotId, { reason: runtime.hold });
    this.lift(runtime, actor);
    await this.writer.commit();
  }

  /** Resets the belief around a pose hint; the event is logged so replay does the same. */
  async relocate(robotId: string, pose: { row: number; col: number; heading?: Heading }, actor: Actor): Promise<void> {
    const runtime = this.runtime(robotId);
    if (!isFreeTile(runtime.plan, pose.row, pose.col)) throw new TesseraError("unprocessable", "relocate", `Tile (${pose.row}, ${pose.col}) is blocked or outside the floorplan.`);
    const payload = { row: pose.row, col: pose.col, ...(pose.heading ? { heading: pose.heading } : {}), by: actor.label };
    applyToFilter(runtime, "relocate", payload);
    const queued = this.writer.event({ robotId, seq: null, missionId: runtime.mission?.id ?? null, source: "operator", kind: "relocate", payload, robotAt: null, receivedAt: new Date() });
    runtime.lastFilterEvent = queued;
    this.snapshot(runtime);
    await this.audit(actor, "relocate", robotId, payload);
    await this.writer.commit();
    const c = runtime.certainty();
    runtime.recordCertainty(c.tileMass);
    if (runtime.mission) {
      runtime.mission.lowSteps = 0;
      runtime.mission.armed = c.tileMass >= this.config.releaseAbove;
    }
    if (runtime.hold === "low_certainty" && c.tileMass >= this.config.releaseAbove) this.lift(runtime, { userId: null, label: "hysteresis" });
    this.publishBelief(runtime);
    this.publish(runtime);
  }

  /** Sends a fault to a connected simulated robot's simulator (never to hardware). */
  async injectFault(robotId: string, fault: SimFaultMessage, actor: Actor): Promise<void> {
    const runtime = this.runtime(robotId);
    if (!runtime.simulated) throw new TesseraError("unprocessable", "fault", `${runtime.name} is hardware; faults are injected into simulated robots only.`);
    if (!runtime.socket?.connected) throw new TesseraError("unprocessable", "fault", `${runtime.name} is not connected.`);
    if (fault.kind === "kidnap" && !isFreeTile(runtime.plan, fault.row, fault.col)) {
      throw new TesseraError("unprocessable", "fault", `Tile (${fault.row}, ${fault.col}) is blocked or outside the floorplan.`);
    }
    await this.audit(actor, "fault", robotId, fault);
    this.logCommand(runtime, "operator", "fault", { ...fault, by: actor.label });
    runtime.socket.emit("fault", fault);
    await this.writer.commit();
  }

  // ——— roster ———

  /**
   * Closes a robot's live link at once, after its key was rotated or it was retired. The
   * robot's reconnect is then refused at the handshake with PROTOCOL.md's `bad_key` or
   * `retired`. True when a connection was dropped.
   */
  dropLink(robotId: string, why: "bad_key" | "retired"): boolean {
    const runtime = this.robots.get(robotId);
    const socket = runtime?.socket;
    if (!runtime || !socket) return false;
    logger.info({ robot: robotId, why }, "closing the robot link");
    runtime.socket = null;
    socket.disconnect(true);
    return true;
  }

  /** Takes a retired robot off the live floor: its mission is aborted (and kept), its link closed. */
  async retire(robotId: string, actor: Actor): Promise<void> {
    const runtime = this.robots.get(robotId);
    if (!runtime) return;
    await runtime.chain;
    if (runtime.mission) {
      this.logCommand(runtime, "operator", "cancel", { by: actor.label, reason: "retired" });
      await this.finish(runtime, "aborted");
    }
    this.dropLink(robotId, "retired");
    runtime.online = false;
    await this.writer.commit();
    this.robots.delete(robotId);
    this.emit("removed", { robotId, floorplanId: runtime.floorplanId });
  }

  /** New motion and sensor parameters and gains; the live filter uses them from its next update. */
  async applySettings(robotId: string, settings: RobotSettings): Promise<void> {
    const runtime = this.robots.get(robotId);
    if (!runtime) return;
    // Between two messages, never halfway through one's motion and sense updates.
    runtime.chain = runtime.chain.then(async () => {
      const before = { motion: runtime.motion, sensor: runtime.sensorModel };
      runtime.applySettings(settings);
      // Logged in line with the messages, so replay switches models exactly where the live filter did.
      this.logCommand(runtime, "operator", MODELS_EVENT, { motion: runtime.motion, sensor: runtime.sensorModel, before });
      await this.writer.commit();
    });
    await runtime.chain;
  }

  /** Sends `tune` with the robot's gains when it is connected; false when it is not. */
  tune(robotId: string, gains: RobotSettings["gains"]): boolean {
    const runtime = this.runtime(robotId);
    if (!runtime.socket?.connected) return false;
    runtime.tuned = { kp: gains.kp, ki: gains.ki, kd: gains.kd };
    this.command(runtime, "tune", { pid: runtime.tuned });
    return true;
  }

  private async audit(actor: Actor, action: string, target: string, detail: Record<string, unknown>): Promise<void> {
    await this.db.insert(audit).values({ userId: actor.userId, action, target, detail });
  }

  private async alert(runtime: RobotRuntime, kind: AlertKind, message: string, missionId = runtime.mission?.id ?? null): Promise<void> {
    try {
      const [{ id }] = await this.db.insert(alerts).values({ robotId: runtime.id, missionId, kind, message }).$returningId();
      this.emit("alert", { id, robotId: runtime.id, kind, message, createdAt: Date.now(), floorplanId: runtime.floorplanId });
    } catch (err) {
      logger.error({ err, robot: runtime.id, kind }, "alert could not be stored");
    }
  }

  // ——— timers ———

  private tick(): void {
    // Nothing timed may write while storage is down; the watchdog resumes once robots are rebuilt.
    if (this.storage.down) return;
    const now = Date.now();
    for (const runtime of this.robots.values()) {
      if (runtime.online && runtime.lastMessageAt !== null && now - runtime.lastMessageAt > this.config.heartbeatTimeoutMs) {
        runtime.online = false;
        logger.info({ robot: runtime.id }, "robot offline: no heartbeat");
        if (runtime.mission && runtime.hold !== "offline") {
          this.placeHold(runtime, "offline", `no message for ${Math.round((now - runtime.lastMessageAt) / 1000)} s`);
        } else {
          this.publish(runtime);
        }
        continue;
      }
      const mission = runtime.mission;
      if (!runtime.online) continue;
      // A resume that finds no mission is spent all the same: a mission dispatched later starts afresh.
      if (runtime.resumeAt !== null && now >= runtime.resumeAt) {
        runtime.resumeAt = null;
        // After a reconnect, re-issue the pending step; the robot ignores a step it has already carried out.
        if (mission?.awaiting === "moved" && !runtime.hold) {
          this.resendStep(runtime, mission);
        } else if (mission && !mission.awaiting) {
          runtime.chain = runtime.chain.then(() => this.advance(runtime, false)).catch((err: unknown) => this.failed(runtime, err, "resume"));
        }
      }
      if (!mission) continue;
      if (mission.awaiting === "moved" && !runtime.hold && mission.stepSentAt !== null && now - mission.stepSentAt > this.config.stepTimeoutMs) {
        // The link is up (beats arrive) but the step went unanswered: lost on the way, or the
        // robot is stuck in it. Once more costs nothing (a robot ignores a step it has carried
        // out); after that, a person should look.
        if (mission.stepResends < 1) {
          mission.stepResends += 1;
          logger.warn({ robot: runtime.id, mission: mission.id, step: mission.step }, "no moved for a sent step; sending it again");
          this.resendStep(runtime, mission);
        } else {
          mission.stepSentAt = null;
          const waitedS = Math.round((2 * this.config.stepTimeoutMs) / 1000);
          this.placeHold(runtime, "fault", `step ${mission.step} was sent twice and not reported done in ${waitedS} s; check the robot before releasing it`);
        }
      }
      if (runtime.hold === "traffic" && !mission.awaiting) {
        runtime.chain = runtime.chain.then(() => this.sendNext(runtime)).catch((err: unknown) => this.failed(runtime, err, "traffic"));
      }
    }
  }

  // ——— frames for dashboards ———

  frame(runtime: RobotRuntime): RobotFrame {
    return robotFrame(runtime);
  }

  frames(floorplanId?: number): RobotFrame[] {
    return [...this.robots.values()].filter((r) => floorplanId === undefined || r.floorplanId === floorplanId).map((r) => this.frame(r));
  }

  marginal(robotId: string): { rows: number; cols: number; marginal: Float32Array } | null {
    const runtime = this.robots.get(robotId);
    if (!runtime) return null;
    return { rows: runtime.plan.rows, cols: runtime.plan.cols, marginal: tileMarginal(runtime.plan, runtime.filter.belief) };
  }

  publish(runtime: RobotRuntime): void {
    this.emit("robot", this.frame(runtime));
  }

  private publishBelief(runtime: RobotRuntime): void {
    this.emit("belief", { robotId: runtime.id, floorplanId: runtime.floorplanId, rows: runtime.plan.rows, cols: runtime.plan.cols, marginal: tileMarginal(runtime.plan, runtime.filter.belief) });
  }
}

function seqOf(raw: unknown): number | null {
  const seq = (raw as { seq?: unknown } | null)?.seq;
  return typeof seq === "number" && Number.isInteger(seq) ? seq : null;
}

function newMission(id: number, goal: Tile, versionId: number, policy: MissionRuntime["policy"], step: number, holds: number): MissionRuntime {
  return { id, goal, versionId, step, awaiting: null, lastAction: null, stepSentAt: null, stepResends: 0, policy, detour: null, detourAround: null, giveWay: null, armed: false, lowSteps: 0, stays: 0, stuckMoves: 0, claim: null, trafficSince: null, holds, minCertainty: 1 };
}
