/** One robot's live state in the fleet service: its filter, link, mission and hold. */
import type { Socket } from "socket.io";
import { certainty, createFilter, type Certainty, type Filter } from "../../lib/belief";
import type { Floorplan, Tile } from "../../lib/floorplan";
import type { MotionModel } from "../../lib/motion";
import type { Policy } from "../../lib/planning";
import { motionModelOf, sensorModelOf, type RobotSettings } from "../../lib/roster";
import type { SenseOutcome, SensorModel, SensorReading, SensorSpec } from "../../lib/sensing";
import type { Action, Drive, HoldReason, MissionOutcome } from "../../lib/vocabulary";
import type { QueuedEvent } from "./writer";

export interface MissionRuntime {
  id: number;
  goal: Tile;
  versionId: number;
  /** Steps sent so far; the next `next` carries step + 1. */
  step: number;
  /** What the link waits for in the step cycle. */
  awaiting: "moved" | "sensed" | null;
  lastAction: Action | null;
  /** When the pending step's `next` last went out, and how often it has been sent again for want of a `moved`. */
  stepSentAt: number | null;
  stepResends: number;
  policy: Policy;
  /** A temporary policy around a robot that blocked this one for too long, and the tile it avoids; dropped once that tile is clear. */
  detour: Policy | null;
  detourAround: Tile | null;
  /** Stepping aside for a robot that has no way round this one: which robot, and the tile to wait on until it has passed. */
  giveWay: { to: string; tile: Tile } | null;
  /** Certainty has reached the release level since the mission started (or the last help). */
  armed: boolean;
  lowSteps: number;
  /** Consecutive `stay` actions chosen short of arrival. */
  stays: number;
  /** Consecutive moves whose odometry says they did not happen. */
  stuckMoves: number;
  claim: Tile | null;
  trafficSince: number | null;
  holds: number;
  minCertainty: number;
}

export class RobotRuntime {
  socket: Socket | null = null;
  online = false;
  lastMessageAt: number | null = null;
  battery: number | null = null;
  fault: string | null = null;
  /** Highest seq applied, hello included (reported to the robot as lastSeq). */
  lastSeq = 0;
  /** Highest non-hello seq applied: lower unseen seqs are out of order. */
  orderSeq = 0;
  hold: HoldReason | null = null;
  mission: MissionRuntime | null = null;
  lastOutcome: { outcome: MissionOutcome; at: number } | null = null;
  certaintyHistory: number[] = [];
  /** Fused steps since the last snapshot. */
  sinceSnapshot = 0;
  /** The last event that changed the belief (moved, sensed, relocate), for snapshots. */
  lastFilterEvent: QueuedEvent | number = 0;
  lastTruth: { row: number; col: number; heading: string } | null = null;
  /** The gains last pushed with `tune`, sent again after each hello: a rebooted robot forgets them. */
  tuned: { kp: number; ki: number; kd: number } | null = null;
  errors: number[] = [];
  /** Serialises this robot's messages: each is applied and committed before the next. */
  chain: Promise<void> = Promise.resolve();
  resumeAt: number | null = null;
  filter: Filter;
  /** Certainty of the current belief, computed once per belief change (frames and traffic checks read it often). */
  private certaintyCache: Certainty | null = null;
  motion: MotionModel;
  sensorModel: SensorModel;

  constructor(
    readonly id: string,
    public name: string,
    readonly simulated: boolean,
    public drive: Drive,
    public floorplanId: number | null,
    public versionId: number,
    public plan: Floorplan,
    public sensors: SensorSpec[],
    public settings: RobotSettings,
  ) {
    this.motion = motionModelOf(drive, settings);
    this.sensorModel = sensorModelOf(settings);
    this.filter = createFilter(plan, this.motion, sensors, this.sensorModel);
  }

  /** New tuning from the roster: the filter is rebuilt on the new models, keeping the belief, so the next update uses them. */
  applySettings(settings: RobotSettings): void {
    const belief = Float64Array.from(this.filter.belief);
    this.settings = settings;
    this.motion = motionModelOf(this.drive, settings);
    this.sensorModel = sensorModelOf(settings);
    this.filter = createFilter(this.plan, this.motion, this.sensors, this.sensorModel, { ranges: this.filter.ranges });
    this.filter.reset(belief);
    this.certaintyCache = null;
  }

  /** Rebuilds the filter for a new sensor set, keeping the belief. */
  setSensors(sensors: SensorSpec[]): void {
    const belief = Float64Array.from(this.filter.belief);
    this.sensors = sensors;
    this.filter = createFilter(this.plan, this.motion, sensors, this.sensorModel, { table: this.filter.table });
    this.filter.reset(belief);
    this.certaintyCache = null;
  }

  /**
   * Moves the robot onto another version of its floorplan: the filter is rebuilt for the
   * new grid; the belief carries over when the shape is unchanged (mass on newly blocked
   * tiles dropped), and is uniform over the free tiles otherwise or when nothing is left.
   */
  switchPlan(versionId: number, plan: Floorplan): void {
    const old = this.plan;
    const belief = Float64Array.from(this.filter.belief);
    this.versionId = versionId;
    this.plan = plan;
    this.filter = createFilter(plan, this.motion, this.sensors, this.sensorModel);
    this.certaintyCache = null;
    if (old.rows !== plan.rows || old.cols !== plan.cols) return;
    try {
      this.filter.reset(belief);
    } catch {
      this.filter.reset();
    }
  }

  /** Prediction step of the filter for one tile action. */
  move(action: Action): void {
    this.filter.motion(action);
    this.certaintyCache = null;
  }

  /** Correction step of the filter for one message's readings. */
  sense(readings: readonly SensorReading[]): SenseOutcome {
    const outcome = this.filter.sense(readings);
    this.certaintyCache = null;
    return outcome;
  }

  /** Replaces the belief (uniform when omitted). */
  reset(belief?: ArrayLike<number>): void {
    this.filter.reset(belief);
    this.certaintyCache = null;
  }

  certainty(): Certainty {
    return (this.certaintyCache ??= certainty(this.plan, this.filter.belief));
  }

  /** Belief mass on one tile over all headings. */
  massOn(tile: Tile): number {
    const base = (tile.row * this.plan.cols + tile.col) * 4;
    const b = this.filter.belief;
    return b[base] + b[base + 1] + b[base + 2] + b[base + 3];
  }

  recordCertainty(value: number): void {
    this.certaintyHistory.push(Math.round(value * 1000) / 1000);
    if (this.certaintyHistory.length > 60) this.certaintyHistory.shift();
  }
}
