import { afterEach, describe, expect, it, vi } from "vitest";
import { DigestRequestSchema, SHIFT_MS, ShiftQuerySchema } from "./reports";

afterEach(() => vi.useRealTimers());

describe("ShiftQuerySchema", () => {
  it("defaults to the shift that ends now, as JSON", () => {
    vi.useFakeTimers({ now: Date.UTC(2026, 2, 1, 14, 0) });
    expect(ShiftQuerySchema.parse({})).toEqual({ from: Date.UTC(2026, 2, 1, 14, 0) - SHIFT_MS, to: Date.UTC(2026, 2, 1, 14, 0), floorplanId: undefined, format: "json" });
  });

  it("takes ISO date-times and epoch milliseconds alike", () => {
    const q = ShiftQuerySchema.parse({ from: "2026-03-01T06:00:00Z", to: String(Date.UTC(2026, 2, 1, 14, 30)), floorplan: "3", format: "csv" });
    expect(q).toEqual({ from: Date.UTC(2026, 2, 1, 6), to: Date.UTC(2026, 2, 1, 14, 30), floorplanId: 3, format: "csv" });
  });

  it("says which field is wrong and why", () => {
    const bad = ShiftQuerySchema.safeParse({ from: "yesterday-ish", to: "2026-03-01T06:00:00Z" });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]).toMatchObject({ path: ["from"], message: expect.stringContaining("neither an ISO date-time") });

    const reversed = ShiftQuerySchema.safeParse({ from: "2026-03-02T00:00:00Z", to: "2026-03-01T00:00:00Z" });
    expect(reversed.error?.issues[0]).toMatchObject({ path: ["from"], message: expect.stringContaining("must be before") });

    const long = ShiftQuerySchema.safeParse({ from: "2026-01-01T00:00:00Z", to: "2026-02-10T00:00:00Z" });
    expect(long.error?.issues[0]).toMatchObject({ path: ["to"], message: "the range spans 40.0 days; at most 31 are allowed" });

    expect(ShiftQuerySchema.safeParse({ format: "xml" }).error?.issues[0].path).toEqual(["format"]);
    expect(ShiftQuerySchema.safeParse({ floorplan: "0" }).error?.issues[0].path).toEqual(["floorplan"]);
  });

  it("accepts exactly 31 days", () => {
    expect(ShiftQuerySchema.safeParse({ from: 0, to: 31 * 86_400_000 }).success).toBe(true);
    expect(ShiftQuerySchema.safeParse({ from: 0, to: 31 * 86_400_000 + 1 }).success).toBe(false);
  });
});

describe("DigestRequestSchema", () => {
  it("takes numbers in a JSON body", () => {
    expect(DigestRequestSchema.parse({ from: 1000, to: 5000, floorplan: 2 })).toEqual({ from: 1000, to: 5000, floorplanId: 2 });
  });
});
