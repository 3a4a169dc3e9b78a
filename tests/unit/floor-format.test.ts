/** Live floor words and numbers: ages, percentages, state labels and sparklines. */
import { describe, expect, it } from "vitest";
import { formatAge, formatPercent, sparklinePath, stateLabel } from "@/components/floor/format";

describe("formatAge", () => {
  const now = 1_700_000_000_000;
  it("counts seconds, minutes, hours and days, rounding down", () => {
    expect(formatAge(now - 59_900, now)).toBe("59 s");
    expect(formatAge(now - 60_000, now)).toBe("1 min");
    expect(formatAge(now - 3_599_000, now)).toBe("59 min");
    expect(formatAge(now - 3_600_000, now)).toBe("1 h");
    expect(formatAge(now - 2 * 86_400_000 - 5, now)).toBe("2 d");
  });

  it("shows a dash for no message and 0 s for a clock ahead of ours", () => {
    expect(formatAge(null, now)).toBe("—");
    expect(formatAge(now + 4000, now)).toBe("0 s");
    expect(formatAge(Number.NaN, now)).toBe("—");
  });
});

describe("formatPercent", () => {
  it("rounds and clamps", () => {
    expect(formatPercent(0.736)).toBe("74 %");
    expect(formatPercent(1.3)).toBe("100 %");
    expect(formatPercent(-0.2)).toBe("0 %");
    expect(formatPercent(null)).toBe("—");
    expect(formatPercent(Number.POSITIVE_INFINITY)).toBe("—");
  });
});

describe("stateLabel", () => {
  it("names the hold reason only when held", () => {
    expect(stateLabel("held", "low_certainty")).toBe("Held · low certainty");
    expect(stateLabel("held", "traffic")).toBe("Held · waiting for traffic");
    expect(stateLabel("held", null)).toBe("Held");
    expect(stateLabel("under_way", "operator")).toBe("Under way");
  });
});

describe("sparklinePath", () => {
  it("spreads values across the width, 1 at the top", () => {
    expect(sparklinePath([0, 1, 0.5], 10, 20)).toBe("M0.00,20.00 L5.00,0.00 L10.00,10.00");
  });

  it("clamps, drops NaN, and needs two points", () => {
    expect(sparklinePath([-1, Number.NaN, 2], 8, 4)).toBe("M0.00,4.00 L8.00,0.00");
    expect(sparklinePath([0.4], 8, 4)).toBe("");
    expect(sparklinePath([], 8, 4)).toBe("");
  });
});
