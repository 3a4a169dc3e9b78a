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
