/**
 * A simulated Tessera robot: the pure plant and controllers of this folder, paced by the
 * wall clock, talking to the server through the same link client a hardware bridge uses.
 *
 * Pacing: a wall-clock timer runs as many fixed physics steps (10 ms of simulated time by
 * default) as the elapsed wall time × timeScale calls for, so timeScale 20 runs the robot
 * twenty times faster than real time with exactly the physics of timeScale 1. Fault
 * durations are in simulated seconds. Heartbeats and idle `sensed` messages run on the
 * wall clock (they are about the link, not the physics).
 *
 * The step cycle (PROTOCOL.md): on `next` the robot carries out the action, then sends
 * `moved` (encoder distance, gyro turn), `sensed` and `truth`. A `hold` brakes at once;
 * an action cut short is still reported, with the odometry it got. A `next` that arrives
 * while held or busy waits for the release or the end of the action; one whose mission and
 * step the robot has already carried out is ignored (a repeat after a reconnect).
 */
import type { Floorplan } from "../lib/floorplan";
import type { ServerMessage } from "../lib/protocol";
import type { Sensor } from "../lib/sensing";
import { HEADINGS, type Drive, type Heading } from "../lib/vocabulary";
import { createRobotClient, type LinkLogger, type LinkState, type RobotClient, type RobotClientOptions, type SeqStore } from "../robots/link-client";
import { createActionController, defaultControlParams, type ActionController, type ControlParams } from "./action-controller";
import {
  createSimState,
  drainBattery,
  kidnapRobot,
  samplePlantParams,
  stallWheel,
  stepRobot,
  stopCommand,
  type PlantParams,
  type SimState,
  type Wheel,
} from "./robot-physics";
import { createRng, deriveSeed } from "./rng";
import { defaultSensorParams, readSensors, truthOf, type SensorParams } from "./sim-sensors";

/** A simulated robot as the fleet file (.data/demo-fleet.json) lists it. */
export interface SimRobotSpec {
  id: string;
  key: string;
  name: string;
  drive: Drive;
  sensors: Sensor[];
  start: { row: number; col: number; heading: Heading };
}

/** Faults an operator can inject; durations in simulated seconds. */
export type SimFault =
  | { kind: "kidnap"; row: number; col: number; heading?: Heading }
  | { kind: "stall"; seconds: number; wheel?: Wheel }
  | { kind: "drop"; seconds: number }
  | { kind: "drain"; level?: number };

export type InjectResult = { ok: true } | { ok: false; reason: string };

export type SimEventKind = "link" | "next" | "moved" | "hold" | "release" | "done" | "tune" | "fault" | "refused" | "ignored";

/** One line of the simulator's log: which robot, what happened, at which simulated time. */
export interface SimEvent {
  robot: string;
  kind: SimEventKind;
  timeS: number;
  detail: Record<string, unknown>;
}

export interface SimSnapshot {
  id: string;
  truth: { row: number; col: number; heading: Heading };
  pose: { x: number; y: number; theta: number };
  timeS: number;
  battery: number;
  link: LinkState;
  action: string | null;
  held: boolean;
  mission: number | null;
  stalled: boolean;
  linkDropped: boolean;
}

export interface SimHandle {
  readonly id: string;
  readonly spec: SimRobotSpec;
  readonly client: RobotClient;
  snapshot(): SimSnapshot;
  inject(fault: SimFault): InjectResult;
  /** Resolves with the first of: signed in (online), refused, replaced or closed. */
  ready(): Promise<LinkState>;
  stop(): void;
}

export interface SimRobotOptions {
  url: string;
  spec: SimRobotSpec;
  plan: Floorplan;
  /** Seed of this robot's random source (physics, sensing and, unless `plant` is given, its manufacturing spread). */
  seed: number;
  /** Simulated seconds per wall-clock second (default 1). */
  timeScale?: number;
  plant?: PlantParams;
  control?: ControlParams;
  sensorParams?: SensorParams;
  seqStore?: SeqStore;
  /** Physics step, simulated seconds (default 0.01). */
  physicsDtS?: number;
  /** Wall-clock period of the pacing timer, ms (default 20). */
  tickMs?: number;
  /** Wall-clock period of `sensed` while idle, ms (default 3000). */
  idleSenseMs?: number;
  link?: Pick<RobotClientOptions, "beatIntervalMs" | "ackTimeoutMs" | "reconnectDelayMs" | "reconnectDelayMaxMs" | "onAck">;
  onEvent?: (event: SimEvent) => void;
  logger?: LinkLogger;
}

const MAX_SIM_S_PER_TICK = 2;
const round = (value: number, digits: number) => Math.round(value * 10 ** digits) / 10 ** digits;

/** Starts one simulated robot: its physics timer and its link to the server. */
export function startSimRobot(opts: SimRobotOptions): SimHandle {
  const { spec, plan } = opts;
  const timeScale = opts.timeScale ?? 1;
  const dtS = opts.physicsDtS ?? 0.01;
  if (!(timeScale > 0) || !Number.isFinite(timeScale)) throw new RangeError("startSimRobot: timeScale must be positive");
  if (!(dtS > 0)) throw new RangeError("startSimRobot: physicsDtS must be positive");
  const rng = createRng(opts.seed);
  const plant = opts.plant ?? samplePlantParams(spec.drive, plan.tileM, createRng(deriveSeed(opts.seed, 1)));
  const sensorParams = opts.sensorParams ?? defaultSensorParams();
  let control = opts.control ?? defaultControlParams();
  let state: SimState = createSimState(plan, plant, { row: spec.start.row, col: spec.start.col, heading: HEADINGS.indexOf(spec.start.heading) });

  let controller: ActionController | null = null;
  let current: ServerMessage["next"] | null = null;
  let queued: ServerMessage["next"] | null = null;
  const carriedOut = new Set<string>();
  let held = false;
  let mission: number | null = null;
  let linkDropped = false;
  let dropTimer: ReturnType<typeof setTimeout> | null = null;
  let lastTruth = "";
  let stopped = false;

  const emit = (kind: SimEventKind, detail: Record<string, unknown> = {}) => opts.onEvent?.({ robot: spec.id, kind, timeS: round(state.timeS, 2), detail });

  let settle: (state: LinkState) => void = () => {};
  const readyPromise = new Promise<LinkState>((resolve) => {
    settle = resolve;
  });

  const beatStatus = () => {
    const stall = state.stall;
    if (stall) return { battery: round(state.battery, 3), status: "fault" as const, fault: `${stall.wheel} wheel stalled` };
    if (state.battery <= 0) return { battery: 0, status: "fault" as const, fault: "battery empty" };
    return { battery: round(state.battery, 3), status: "ok" as const };
  };

  const deliver = (promise: Promise<{ ok: boolean; code?: string; message?: string }>, event: string) => {
    promise
      .then((ack) => {
        if (!ack.ok) emit("refused", { event, code: ack.code, message: ack.message });
      })
      .catch(() => {});
  };

  const client = createRobotClient({
    url: opts.url,
    robotId: spec.id,
    key: spec.key,
    hello: { model: spec.drive === "bicycle" ? "Tessera sim cart" : "Tessera sim base", drive: spec.drive, sensors: spec.sensors },
    seqStore: opts.seqStore,
    ...opts.link,
    status: beatStatus,
    logger: opts.logger,
    onState: (linkState, detail) => {
      emit("link", { state: linkState, ...detail });
      if (linkState !== "connecting" && linkState !== "offline") settle(linkState);
    },
    onHello: () => {
      if (!controller) observe(true);
    },
    onNext: (msg) => {
      const key = `${msg.mission}:${msg.step}`;
      if (carriedOut.has(key) || (current && `${current.mission}:${current.step}` === key)) {
        emit("ignored", { reason: "step already carried out", mission: msg.mission, step: msg.step });
        return;
      }
      mission = msg.mission;
      if (held || controller) {
        queued = msg;
        emit("next", { mission: msg.mission, step: msg.step, action: msg.action, waiting: held ? "hold" : "action" });
        return;
      }
      begin(msg);
    },
    onHold: (msg) => {
      held = true;
      controller?.abort();
      emit("hold", { reason: msg.reason, mission: msg.mission, braking: controller !== null });
    },
    onRelease: (msg) => {
      held = false;
      emit("release", { mission: msg.mission });
      if (queued && !controller) {
        const next = queued;
        queued = null;
        begin(next);
      }
    },
    onDone: (msg) => {
      emit("done", { mission: msg.mission, outcome: msg.outcome });
      if (mission === msg.mission) mission = null;
      if (queued?.mission === msg.mission) queued = null;
    },
    onFault: (msg) => {
      const result = handle.inject(msg);
      if (!result.ok) emit("refused", { event: "fault", code: "bad_fault", message: result.reason });
    },
    onTune: (msg) => {
      control = {
        ...control,
        pid: { ...msg.pid },
        maxTurnRateRadS: msg.maxTurnRateDegS !== undefined ? (msg.maxTurnRateDegS * Math.PI) / 180 : control.maxTurnRateRadS,
        cruiseMS: msg.cruiseSpeedMS ?? control.cruiseMS,
      };
      emit("tune", { pid: msg.pid, maxTurnRateDegS: msg.maxTurnRateDegS, cruiseSpeedMS: msg.cruiseSpeedMS });
    },
  });

  /** Sends what the sensors read now, and the true pose when it changed (or when `forceTruth`). */
  function observe(forceTruth: boolean) {
    deliver(client.send("sensed", { readings: readSensors(state, spec.sensors, sensorParams, rng) }), "sensed");
    const truth = truthOf(state);
    const key = `${truth.row}:${truth.col}:${truth.heading}`;
    if (forceTruth || key !== lastTruth) {
      lastTruth = key;
      deliver(client.send("truth", truth), "truth");
    }
  }

  function begin(msg: ServerMessage["next"]) {
    current = msg;
    controller = createActionController(msg.action, state, control);
    emit("next", { mission: msg.mission, step: msg.step, action: msg.action });
  }

  function finish() {
    if (!controller || !current) return;
    const report = controller.report();
    carriedOut.add(`${current.mission}:${current.step}`);
    controller = null;
    current = null;
    deliver(client.send("moved", { action: report.action, odometry: { distanceM: round(report.distanceM, 4), turnDeg: round(report.turnDeg, 2) } }), "moved");
    observe(true);
    emit("moved", {
      action: report.action,
      distanceM: round(report.distanceM, 4),
      turnDeg: round(report.turnDeg, 2),
      bumped: report.bumped,
      gaveUp: report.gaveUp,
      aborted: report.aborted,
      truth: truthOf(state),
    });
    if (queued && !held) {
      const next = queued;
      queued = null;
      begin(next);
    }
  }

  const stop = stopCommand(spec.drive);
  let lastWallMs = performance.now();
  let pendingS = 0;
  const tick = () => {
    const now = performance.now();
    pendingS = Math.min(MAX_SIM_S_PER_TICK, pendingS + ((now - lastWallMs) / 1000) * timeScale);
    lastWallMs = now;
    while (pendingS >= dtS) {
      pendingS -= dtS;
      let command = stop;
      if (controller) {
        command = controller.command(state, dtS);
        if (controller.finished) finish();
      }
      state = stepRobot(state, command, dtS, rng);
    }
  };
  const physicsTimer = setInterval(tick, opts.tickMs ?? 20);
  const idleTimer = setInterval(() => {
    if (!controller && client.state === "online") observe(false);
  }, opts.idleSenseMs ?? 3000);

  const apply = (result: { ok: true; state: SimState } | { ok: false; reason: string }, fault: SimFault): InjectResult => {
    if (!result.ok) return result;
    state = result.state;
    emit("fault", { ...fault, truth: truthOf(state) });
    return { ok: true };
  };

  const handle: SimHandle = {
    id: spec.id,
    spec,
    client,
    snapshot() {
      return {
        id: spec.id,
        truth: truthOf(state),
        pose: { ...state.pose },
        timeS: state.timeS,
        battery: state.battery,
        link: client.state,
        action: current?.action ?? null,
        held,
        mission,
        stalled: state.stall !== null,
        linkDropped,
      };
    },
    inject(fault) {
      if (stopped) return { ok: false, reason: "robot stopped" };
      switch (fault.kind) {
        case "kidnap": {
          const heading = fault.heading === undefined ? undefined : HEADINGS.indexOf(fault.heading);
          const result = apply(kidnapRobot(state, { row: fault.row, col: fault.col, heading }), fault);
          if (result.ok && !controller && client.state === "online") observe(true);
          return result;
        }
        case "stall":
          return apply(stallWheel(state, fault.wheel ?? "left", fault.seconds), fault);
        case "drain":
          return apply(drainBattery(state, fault.level), fault);
        case "drop": {
          if (!(fault.seconds > 0) || !Number.isFinite(fault.seconds)) return { ok: false, reason: "drop seconds must be positive" };
          if (dropTimer) clearTimeout(dropTimer);
          linkDropped = true;
          client.pause();
          dropTimer = setTimeout(() => {
            dropTimer = null;
            linkDropped = false;
            client.resume();
          }, (fault.seconds * 1000) / timeScale);
          emit("fault", { ...fault });
          return { ok: true };
        }
      }
    },
    ready: () => readyPromise,
    stop() {
      if (stopped) return;
      stopped = true;
      clearInterval(physicsTimer);
      clearInterval(idleTimer);
      if (dropTimer) clearTimeout(dropTimer);
      client.close();
    },
  };
  return handle;
}
