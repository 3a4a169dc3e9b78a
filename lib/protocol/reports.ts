/**
 * The shift summary's wire shapes, shared by the reports page, its routes and the digest:
 * the query (a time range and an optional floorplan) and the summary it answers with.
 * Instants are epoch milliseconds on the wire; durations are seconds.
 */
import { z } from "zod";
import { HOLD_REASONS } from "../vocabulary";

/** A shift, the range the page and the digest default to, ms. */
export const SHIFT_MS = 8 * 3600_000;

/** Longest range a summary may cover, ms: the aggregates stay cheap and the digest readable. */
export const MAX_RANGE_DAYS = 31;
const MAX_RANGE_MS = MAX_RANGE_DAYS * 86_400_000;

/** An instant given as epoch milliseconds (number or digits) or an ISO 8601 date-time. */
const Instant = z.union([z.number(), z.string().trim().min(1, "is empty")]).transform((raw, ctx) => {
  const ms = typeof raw === "number" ? raw : /^\d+$/.test(raw) ? Number(raw) : Date.parse(raw);
  if (!Number.isSafeInteger(ms) || ms < 0) {
    ctx.addIssue({ code: "custom", message: `"${raw}" is neither an ISO date-time (2026-03-01T06:00:00Z) nor epoch milliseconds` });
    return z.NEVER;
  }
  return ms;
});

const RangeFields = z.object({
  from: Instant.optional(),
  to: Instant.optional(),
  floorplan: z.coerce.number().int("must be a whole number").positive("must be a floorplan id").optional(),
});

/**
 * Fills the defaults (to = now, from = to − one shift) and checks the range; `now` is read
 * when the query is parsed, so a page left open asks for the shift that ends then.
 */
function withRange<T extends z.infer<typeof RangeFields>>(input: T, ctx: z.RefinementCtx) {
  const to = input.to ?? Date.now();
  const from = input.from ?? to - SHIFT_MS;
  if (from >= to) ctx.addIssue({ code: "custom", path: ["from"], message: `must be before "to" (${new Date(to).toISOString()})` });
  else if (to - from > MAX_RANGE_MS) {
    ctx.addIssue({ code: "custom", path: ["to"], message: `the range spans ${((to - from) / 86_400_000).toFixed(1)} days; at most ${MAX_RANGE_DAYS} are allowed` });
  }
  return { from, to, floorplanId: input.floorplan };
}

/** GET /api/reports/shift?from=&to=&floorplan=&format=json|csv */
export const ShiftQuerySchema = RangeFields.extend({ format: z.enum(["json", "csv"]).default("json") }).transform((input, ctx) => ({
  ...withRange(input, ctx),
  format: input.format,
}));
export type ShiftQuery = z.infer<typeof ShiftQuerySchema>;

/** POST /api/reports/shift/digest body: the same range, as JSON. */
export const DigestRequestSchema = RangeFields.transform(withRange);
export type DigestRequest = z.infer<typeof DigestRequestSchema>;

/** The range a summary covers: [from, to) in epoch ms, optionally one floorplan's missions. */
export interface ShiftRange {
  from: number;
  to: number;
  floorplanId?: number;
}

export const HoldsByReasonSchema = z.object(Object.fromEntries(HOLD_REASONS.map((r) => [r, z.number().int().min(0)])) as Record<(typeof HOLD_REASONS)[number], z.ZodNumber>);
export type HoldsByReason = z.infer<typeof HoldsByReasonSchema>;

/** The figures of a summary, for the whole range or one robot. */
export const ShiftFiguresSchema = z.object({
  /** Missions started in the range. */
  started: z.number().int().min(0),
  reached: z.number().int().min(0),
  aborted: z.number().int().min(0),
  failed: z.number().int().min(0),
  /** Still under way at the end of the range. */
  active: z.number().int().min(0),
  /** Sum over those missions of the time from start to end, or to the end of the range, s. */
  underWayS: z.number().min(0),
  /** Median start-to-arrival time of the reached missions, s; null when none reached. */
  medianReachS: z.number().min(0).nullable(),
  /** Lowest and mean of each mission's lowest certainty; null when no mission recorded one. */
  certaintyMin: z.number().min(0).max(1).nullable(),
  certaintyMean: z.number().min(0).max(1).nullable(),
  /** Holds placed during those missions, by reason. */
  holds: HoldsByReasonSchema,
});
export type ShiftFigures = z.infer<typeof ShiftFiguresSchema>;

export const ShiftRobotRowSchema = ShiftFiguresSchema.extend({ robotId: z.string(), robotName: z.string() });
export type ShiftRobotRow = z.infer<typeof ShiftRobotRowSchema>;

export const ShiftSummarySchema = z.object({
  from: z.number().int(),
  to: z.number().int(),
  floorplanId: z.number().int().nullable(),
  totals: ShiftFiguresSchema,
  /** One row per robot that started a mission in the range, by name. */
  robots: z.array(ShiftRobotRowSchema),
});
export type ShiftSummary = z.infer<typeof ShiftSummarySchema>;

/** Total holds of one set of figures. */
export function holdCount(holds: HoldsByReason): number {
  return HOLD_REASONS.reduce((sum, r) => sum + holds[r], 0);
}
