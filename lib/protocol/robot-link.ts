/**
 * The robot link, version 1 (PROTOCOL.md), as zod schemas shared by the server, the
 * robot client and the simulator. Field names and codes here are a public contract.
 */
import { z } from "zod";
import type { SensorReading, SensorSpec } from "../sensing";
import { ACK_CODES, ACTIONS, DRIVES, HEADINGS, HOLD_REASONS, MISSION_OUTCOMES, ROBOT_STATES } from "../vocabulary";

export const PROTOCOL_VERSION = 1;

/** Largest accepted message, in bytes of its JSON; bigger ones are refused with too_large. */
export const MAX_MESSAGE_BYTES = 16 * 1024;

const sensorId = z.string().min(1).max(32);

export const SensorSchema = z.discriminatedUnion("kind", [
  z.object({ id: sensorId, kind: z.literal("range"), bearingDeg: z.number().min(-180).max(180), maxRangeM: z.number().positive().max(50) }),
  z.object({ id: sensorId, kind: z.literal("floor") }),
]);

export const ReadingSchema = z.union([
  z.object({ sensor: sensorId, rangeM: z.number().min(0).max(1000) }).strict(),
  z.object({ sensor: sensorId, mark: z.number().int().min(0).max(255) }).strict(),
]);

const envelope = {
  seq: z.number().int().min(1).max(Number.MAX_SAFE_INTEGER),
  at: z.number().int().min(0),
};

export const HelloSchema = z.object({
  ...envelope,
  protocol: z.literal(PROTOCOL_VERSION),
  model: z.string().max(80),
  drive: z.enum(DRIVES),
  sensors: z.array(SensorSchema).max(16),
});

export const BeatSchema = z.object({
  ...envelope,
  battery: z.number().min(0).max(1),
  status: z.enum(["ok", "fault"]),
  fault: z.string().max(200).optional(),
});

export const MovedSchema = z.object({
  ...envelope,
  action: z.enum(ACTIONS),
  odometry: z.object({ distanceM: z.number().min(-100).max(100), turnDeg: z.number().min(-3600).max(3600) }).optional(),
});

export const SensedSchema = z.object({
  ...envelope,
  readings: z.array(ReadingSchema).max(32),
});

export const TruthSchema = z.object({
  ...envelope,
  row: z.number().int().min(0).max(511),
  col: z.number().int().min(0).max(511),
  heading: z.enum(HEADINGS),
});

/** Robot → server events and their schemas, in PROTOCOL.md's order. */
export const ROBOT_EVENTS = {
  hello: HelloSchema,
  beat: BeatSchema,
  moved: MovedSchema,
  sensed: SensedSchema,
  truth: TruthSchema,
} as const;
export type RobotEventName = keyof typeof ROBOT_EVENTS;
export const ROBOT_EVENT_NAMES = Object.keys(ROBOT_EVENTS) as RobotEventName[];

export type Hello = z.infer<typeof HelloSchema>;
export type Beat = z.infer<typeof BeatSchema>;
export type Moved = z.infer<typeof MovedSchema>;
export type Sensed = z.infer<typeof SensedSchema>;
export type Truth = z.infer<typeof TruthSchema>;
export type RobotMessage = { [K in RobotEventName]: z.infer<(typeof ROBOT_EVENTS)[K]> };

export const MissionRefSchema = z.object({
  id: z.number().int(),
  goal: z.object({ row: z.number().int(), col: z.number().int() }),
  step: z.number().int().min(0),
});

export const AckSchema = z.union([
  z.object({
    ok: z.literal(true),
    seq: z.number().int(),
    dup: z.literal(true).optional(),
    lastSeq: z.number().int().min(0).optional(),
    state: z.enum(ROBOT_STATES).optional(),
    mission: MissionRefSchema.nullable().optional(),
  }),
  z.object({
    ok: z.literal(false),
    seq: z.number().int().nullable(),
    code: z.enum(ACK_CODES),
    message: z.string(),
    lastSeq: z.number().int().min(0).optional(),
    state: z.enum(ROBOT_STATES).optional(),
  }),
]);
export type Ack = z.infer<typeof AckSchema>;

/** Server → robot events. */
export const NextSchema = z.object({ mission: z.number().int(), step: z.number().int().min(1), action: z.enum(ACTIONS) });
export const HoldSchema = z.object({ reason: z.enum(HOLD_REASONS), mission: z.number().int().optional() });
export const ReleaseSchema = z.object({ mission: z.number().int().optional() });
export const DoneSchema = z.object({ mission: z.number().int(), outcome: z.enum(MISSION_OUTCOMES) });
export const TuneSchema = z.object({
  pid: z.object({ kp: z.number(), ki: z.number(), kd: z.number() }),
  maxTurnRateDegS: z.number().positive().optional(),
  cruiseSpeedMS: z.number().positive().optional(),
});

/**
 * Simulator only, an addition to PROTOCOL.md version 1: an admin's fault injection for a
 * simulated robot (kidnap, stall a wheel, drop the link, drain the battery). Hardware
 * clients never receive it; seconds are simulated seconds.
 */
export const SimFaultSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("kidnap"), row: z.number().int().min(0).max(511), col: z.number().int().min(0).max(511), heading: z.enum(HEADINGS).optional() }),
  z.object({ kind: z.literal("stall"), seconds: z.number().positive().max(600), wheel: z.enum(["left", "right"]).optional() }),
  z.object({ kind: z.literal("drop"), seconds: z.number().positive().max(600) }),
  z.object({ kind: z.literal("drain"), level: z.number().min(0).max(1).optional() }),
]);
export type SimFaultMessage = z.infer<typeof SimFaultSchema>;

export const SERVER_EVENTS = {
  next: NextSchema,
  hold: HoldSchema,
  release: ReleaseSchema,
  done: DoneSchema,
  tune: TuneSchema,
  fault: SimFaultSchema,
} as const;
export type ServerEventName = keyof typeof SERVER_EVENTS;
export type ServerMessage = { [K in ServerEventName]: z.infer<(typeof SERVER_EVENTS)[K]> };

// The wire schemas and lib/sensing's types must describe the same shapes; tsc fails otherwise.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
type Assert<T extends true> = T;
export type WireShapesAgree = [Assert<Same<z.infer<typeof SensorSchema>, SensorSpec>>, Assert<Same<z.infer<typeof ReadingSchema>, SensorReading>>];
