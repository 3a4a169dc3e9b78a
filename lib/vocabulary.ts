/**
 * Tessera's domain vocabulary. Each list is declared once here; TypeScript unions,
 * zod enums and database enums are all derived from these tuples.
 */

/** Headings, clockwise from north; the index is the heading's number in a state index. */
export const HEADINGS = ["N", "E", "S", "W"] as const;
export type Heading = (typeof HEADINGS)[number];

/** Tile actions a robot can be told to carry out; the index is the action's number in a policy. */
export const ACTIONS = ["forward", "left", "right", "stay"] as const;
export type Action = (typeof ACTIONS)[number];

/** Marks a state where the policy has no action (blocked tile, unreachable goal). */
export const NO_ACTION = 255;

export const DRIVES = ["differential", "bicycle"] as const;
export type Drive = (typeof DRIVES)[number];

export const ROLES = ["viewer", "operator", "admin"] as const;
export type Role = (typeof ROLES)[number];

/** Row and column offsets of one tile step for each heading (row grows downward). */
export const HEADING_STEP: readonly (readonly [number, number])[] = [
  [-1, 0],
  [0, 1],
  [1, 0],
  [0, -1],
];

/** What a robot is doing, as the live floor shows it. */
export const ROBOT_STATES = ["idle", "under_way", "held", "arrived", "offline"] as const;
export type RobotState = (typeof ROBOT_STATES)[number];

/** Why a robot is held (PROTOCOL.md, `hold`). */
export const HOLD_REASONS = ["low_certainty", "operator", "offline", "traffic", "fault"] as const;
export type HoldReason = (typeof HOLD_REASONS)[number];

/** How a mission ended (PROTOCOL.md, `done`). */
export const MISSION_OUTCOMES = ["reached", "aborted", "failed"] as const;
export type MissionOutcome = (typeof MISSION_OUTCOMES)[number];

/** A mission row's state: active until it ends with one of the outcomes. */
export const MISSION_STATES = ["active", ...MISSION_OUTCOMES] as const;
export type MissionState = (typeof MISSION_STATES)[number];

/** Refusal codes of a robot message's acknowledgement (PROTOCOL.md). */
export const ACK_CODES = ["bad_message", "too_large", "out_of_order", "no_mission", "rate_limited", "internal"] as const;
export type AckCode = (typeof ACK_CODES)[number];

/** Refusal codes of a /robot handshake (PROTOCOL.md). */
export const HANDSHAKE_CODES = ["bad_key", "unknown_robot", "retired", "already_connected"] as const;
export type HandshakeCode = (typeof HANDSHAKE_CODES)[number];

export const ALERT_KINDS = ["low_certainty", "offline", "fault", "traffic", "battery", "mission_failed"] as const;
export type AlertKind = (typeof ALERT_KINDS)[number];
