import { describe, expect, it } from "vitest";
import type { ShiftFigures, ShiftSummary } from "../protocol/reports";
import { SHIFT_CSV_COLUMNS, shiftSummaryCsv } from "./shift-csv";

const figures = (over: Partial<ShiftFigures>): ShiftFigures => ({
  started: 0,
  reached: 0,
  aborted: 0,
  failed: 0,
  active: 0,
  underWayS: 0,
  medianReachS: null,
  certaintyMin: null,
  certaintyMean: null,
  holds: { low_certainty: 0, operator: 0, offline: 0, traffic: 0, fault: 0 },
  ...over,
});

describe("shiftSummaryCsv", () => {
  it("writes a header, a row per robot and a totals row, quoting names with commas", () => {
    const summary: ShiftSummary = {
      from: 0,
      to: 1,
      floorplanId: null,
      robots: [
        { robotId: "rb-1", robotName: 'Otter, "the quick"', ...figures({ started: 3, reached: 2, failed: 1, underWayS: 95.12345, medianReachS: 30.5, certaintyMin: 0.25, certaintyMean: 0.6, holds: { low_certainty: 2, operator: 0, offline: 0, traffic: 1, fault: 0 } }) },
        { robotId: "rb-2", robotName: "Magpie", ...figures({ started: 1, aborted: 1, underWayS: 7 }) },
      ],
      totals: figures({ started: 4, reached: 2, aborted: 1, failed: 1, underWayS: 102.12345, medianReachS: 30.5, certaintyMin: 0.25, certaintyMean: 0.6, holds: { low_certainty: 2, operator: 0, offline: 0, traffic: 1, fault: 0 } }),
    };
    const lines = shiftSummaryCsv(summary).split("\r\n");
    expect(lines[0]).toBe(SHIFT_CSV_COLUMNS.join(","));
    expect(lines[1]).toBe('rb-1,"Otter, ""the quick""",3,2,0,1,0,95.123,30.5,0.25,0.6,2,0,0,1,0');
    expect(lines[2]).toBe("rb-2,Magpie,1,0,1,0,0,7,,,,0,0,0,0,0");
    expect(lines[3]).toBe(",All robots,4,2,1,1,0,102.123,30.5,0.25,0.6,2,0,0,1,0");
    expect(lines[4]).toBe("");
  });
});
