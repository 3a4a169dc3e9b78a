/**
 * The live floor's heat colours: a log axis from 1e-4 to 1 onto [0, 1], then the ramp.
 * Expected positions are log10 arithmetic (log10(1e-2) lies halfway between -4 and 0).
 */
import { describe, expect, it } from "vitest";
import { HEAT_MIN_MASS, HEAT_STOPS, heatColourScale, heatRgbaTable, heatIndex, heatOpacity, heatPosition } from "@/components/floor/heat-scale";

describe("heatPosition", () => {
  it("places masses on the log axis", () => {
    expect(heatPosition(1)).toBeCloseTo(1, 12);
    expect(heatPosition(1e-2)).toBeCloseTo(0.5, 12);
    expect(heatPosition(1e-3)).toBeCloseTo(0.25, 12);
    expect(heatPosition(0.1)).toBeCloseTo(0.75, 12);
  });

  it("clears the faintest masses and never leaks NaN", () => {
    expect(heatPosition(HEAT_MIN_MASS)).toBe(0);
    expect(heatPosition(3e-5)).toBe(0);
    expect(heatPosition(0)).toBe(0);
    expect(heatPosition(Number.NaN)).toBe(0);
    expect(heatPosition(2.4)).toBe(1);
  });
});

describe("heatColourScale", () => {
  it("passes through each stop of the ramp", () => {
    const colour = heatColourScale();
    // #0b3b4a = rgb(11, 59, 74); #2dd4bf = rgb(45, 212, 191); #fff7d6 = rgb(255, 247, 214)
    expect(colour(0)).toBe("rgb(11, 59, 74)");
    expect(colour(0.5)).toBe("rgb(45, 212, 191)");
    expect(colour(1)).toBe("rgb(255, 247, 214)");
    expect(HEAT_STOPS).toHaveLength(5);
  });
});

describe("heatOpacity and heatRgbaTable", () => {
  it("rises from faint tails to 0.9 at the peak", () => {
    expect(heatOpacity(0)).toBe(0);
    expect(heatOpacity(0.25)).toBeCloseTo(0.36, 12);
    expect(heatOpacity(1)).toBeCloseTo(0.9, 12);
  });

  it("precomputes 256 RGBA entries, the first transparent and the last the ramp's end", () => {
    const table = heatRgbaTable();
    expect(table).toHaveLength(1024);
    expect([...table.subarray(0, 4)]).toEqual([0, 0, 0, 0]);
    // 0.18 + 0.72 is 0.8999… in binary floating point: 229.49… rounds to 229
    expect([...table.subarray(1020, 1024)]).toEqual([255, 247, 214, 229]);
    // halfway up the table (entry 128, position 0.502) sits just past the middle stop #2dd4bf
    expect([...table.subarray(512, 515)].map((v, i) => Math.abs(v - [45, 212, 191][i]) <= 2)).toEqual([true, true, true]);
  });

  it("indexes a mass into the table", () => {
    expect(heatIndex(1)).toBe(255);
    expect(heatIndex(1e-2)).toBe(128);
    expect(heatIndex(1e-5)).toBe(0);
    expect(heatIndex(1.0001e-4)).toBe(1);
  });
});
