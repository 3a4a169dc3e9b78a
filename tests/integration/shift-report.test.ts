/**
 * The shift summary (issue 7, part 6) against seeded missions with known outcomes,
 * durations, certainties and holds: every figure is recomputed here from the seed rows.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { sql } from "drizzle-orm";
import { events } from "../../db/schema";
import type { ShiftFigures, ShiftSummary } from "../../lib/protocol/reports";
import { shiftSummaryCsv, SHIFT_CSV_COLUMNS, TOTALS_LABEL } from "../../lib/reports/shift-csv";
import { HOLD_REASONS, MISSION_STATES, type HoldReason } from "../../lib/vocabulary";
import { shiftScope, shiftSummary } from "../../server/reports/shift";
import { seededUniform } from "../support/plans";
import { seedFloorplan, seedMissions, seedRobots, type SeedMission } from "../support/report-seed";

// A shift well in the past, so no other suite's missions (all started "now") fall into it.
const FROM = Date.UTC(2025, 5, 3, 6, 0);
const TO = FROM + 8 * 3600_000;

let db: Db;
let seeded: (SeedMission & { floorplanId: number })[] = [];
const names = new Map<string, string>();
let floorA = 0;
let floorB = 0;

beforeAll(async () => {
  db = openDb(inject("databaseUrl"));
  const stamp = Date.now() % 1_000_000;
  const a = await seedFloorplan(db, `Report bay A ${stamp}`);
  const b = await seedFloorplan(db, `Report bay B ${stamp}`);
  floorA = a.floorplanId;
  floorB = b.floorplanId;
  const onA = await seedRobots(db, a.floorplanId, ["Birch", "Alder"]);
  const onB = await seedRobots(db, b.floorplanId, ["Cedar"]);
  [...onA, ...onB].forEach((id, i) => names.set(id, ["Birch", "Alder", "Cedar"][i]));

  const random = seededUniform(7);
  const pick = <T,>(list: readonly T[]) => list[Math.floor(random() * list.length)];
  const list: (SeedMission & { floorplanId: number })[] = [];
  const robotsOn = [...onA.map((id) => ({ id, ...a })), ...onB.map((id) => ({ id, ...b }))];
  for (let i = 0; i < 60; i++) {
    const robot = robotsOn[i % 3];
    const state = pick(MISSION_STATES.filter((s) => s !== "active"));
    // Starts spread over a range a little wider than the shift, some before and after it.
    const startedAt = FROM - 3600_000 + Math.floor(random() * 10 * 3600_000);
    const durationMs = 5_000 + Math.floor(random() * 600_000);
    const holds = Array.from({ length: Math.floor(random() * 3) }, () => pick(HOLD_REASONS));
    list.push({ robotId: robot.id, versionId: robot.versionId, floorplanId: robot.floorplanId, state, startedAt, endedAt: startedAt + durationMs, minCertainty: random() < 0.1 ? null : Math.round(random() * 1000) / 1000, holds });
  }
  // Edges: one starting exactly at `from` (in), one exactly at `to` (out), one still under way, one running past `to`.
  list.push({ robotId: onA[0], versionId: a.versionId, floorplanId: a.floorplanId, state: "reached", startedAt: FROM, endedAt: FROM + 42_000, minCertainty: 0.9, holds: ["operator"] });
  list.push({ robotId: onA[0], versionId: a.versionId, floorplanId: a.floorplanId, state: "reached", startedAt: TO, endedAt: TO + 10_000, minCertainty: 0.01, holds: ["fault"] });
  list.push({ robotId: onB[0], versionId: b.versionId, floorplanId: b.floorplanId, state: "active", startedAt: TO - 3600_000, endedAt: null, minCertainty: 0.5, holds: ["traffic", "traffic"] });
  list.push({ robotId: onA[1], versionId: a.versionId, floorplanId: a.floorplanId, state: "aborted", startedAt: TO - 60_000, endedAt: TO + 60_000, minCertainty: 0.7 });
  const ids = await seedMissions(db, list);
  seeded = list;
  // A month of earlier missions outside the range, so the table is large enough for the planner to prefer an index.
  await seedMissions(db, Array.from({ length: 2000 }, (_, i) => ({ robotId: onB[0], versionId: b.versionId, state: "reached" as const, startedAt: FROM - 30 * 86_400_000 + i * 60_000, endedAt: FROM - 30 * 86_400_000 + i * 60_000 + 5000, minCertainty: 0.4 })));

  // Logged but not holds of the server: an operator's hold request and a release.
  await db.insert(events).values([
    { robotId: onA[1], seq: null, missionId: ids[0], source: "operator", kind: "hold", payload: { by: "Op" }, robotAt: null, receivedAt: new Date(FROM + 5000) },
    { robotId: onA[1], seq: null, missionId: ids[0], source: "server", kind: "release", payload: { mission: ids[0] }, robotAt: null, receivedAt: new Date(FROM + 6000) },
  ]);
});

afterAll(async () => {
  await closeDb();
});

function median(values: number[]): number | null {
  if (!values.length) return null;
  const sorted = [...values].sort((x, y) => x - y);
  const mid = (sorted.length - 1) / 2;
  return (sorted[Math.floor(mid)] + sorted[Math.ceil(mid)]) / 2;
}

/** The figures of the seed rows, computed without SQL. */
function expected(rows: SeedMission[]): ShiftFigures {
  const inRange = rows.filter((m) => m.startedAt >= FROM && m.startedAt < TO);
  const certainties = inRange.map((m) => m.minCertainty).filter((c): c is number => c !== null);
  const holds = Object.fromEntries(HOLD_REASONS.map((r) => [r, 0])) as Record<HoldReason, number>;
  for (const m of inRange) for (const h of m.holds ?? []) holds[h] += 1;
  return {
    started: inRange.length,
    reached: inRange.filter((m) => m.state === "reached").length,
    aborted: inRange.filter((m) => m.state === "aborted").length,
    failed: inRange.filter((m) => m.state === "failed").length,
    active: inRange.filter((m) => m.state === "active").length,
    underWayS: inRange.reduce((s, m) => s + (Math.min(m.endedAt ?? TO, TO) - m.startedAt) / 1000, 0),
    medianReachS: median(inRange.filter((m) => m.state === "reached").map((m) => (m.endedAt! - m.startedAt) / 1000)),
    certaintyMin: certainties.length ? Math.min(...certainties) : null,
    certaintyMean: certainties.length ? certainties.reduce((s, c) => s + c, 0) / certainties.length : null,
    holds,
  };
}

function expectFigures(actual: ShiftFigures, want: ShiftFigures) {
  const { underWayS, medianReachS, certaintyMin, certaintyMean, started, reached, aborted, failed, active, holds } = actual;
  const counts = { started, reached, aborted, failed, active, holds };
  const { underWayS: wUnder, medianReachS: wMedian, certaintyMin: wMin, certaintyMean: wMean, ...wCounts } = want;
  expect(counts).toEqual(wCounts);
  expect(underWayS).toBeCloseTo(wUnder, 3);
  for (const [got, exp] of [[medianReachS, wMedian], [certaintyMin, wMin], [certaintyMean, wMean]] as const) {
    if (exp === null) expect(got).toBeNull();
    else expect(got).toBeCloseTo(exp, 6);
  }
}

describe("shift summary", () => {
  it("counts one floorplan's missions by outcome, time under way, median to reach, certainty and holds, per robot", async () => {
    const summary = await shiftSummary(db, { from: FROM, to: TO, floorplanId: floorA });
    const mine = seeded.filter((m) => m.floorplanId === floorA);
    expect(summary).toMatchObject({ from: FROM, to: TO, floorplanId: floorA });
    expectFigures(summary.totals, expected(mine));
    expect(summary.robots.map((r) => r.robotName)).toEqual(["Alder", "Birch"]);
    for (const row of summary.robots) expectFigures(row, expected(mine.filter((m) => m.robotId === row.robotId)));
    // The seed is rich enough that every figure is exercised.
    expect(summary.totals.started).toBeGreaterThan(15);
    expect(summary.totals.reached).toBeGreaterThan(3);
    expect(summary.totals.holds.operator).toBeGreaterThan(0);
  });

  it("counts a still-active mission up to the end of the range and the other floorplan apart", async () => {
    const summary = await shiftSummary(db, { from: FROM, to: TO, floorplanId: floorB });
    const want = expected(seeded.filter((m) => m.floorplanId === floorB));
    expect(want.active).toBe(1);
    expectFigures(summary.totals, want);
    expect(summary.robots.map((r) => r.robotName)).toEqual(["Cedar"]);
  });

  it("covers every floorplan without one, and answers zeros for an empty range", async () => {
    const all = await shiftSummary(db, { from: FROM, to: TO });
    expect(all.floorplanId).toBeNull();
    expectFigures(all.totals, expected(seeded));
    expect(all.robots.map((r) => r.robotName)).toEqual(["Alder", "Birch", "Cedar"]);

    const empty = await shiftSummary(db, { from: FROM - 86_400_000 * 3, to: FROM - 86_400_000 * 2, floorplanId: floorA });
    expect(empty.robots).toEqual([]);
    expect(empty.totals).toMatchObject({ started: 0, reached: 0, underWayS: 0, medianReachS: null, certaintyMin: null, certaintyMean: null });
  });

  it("reads the range through an index on the start time rather than the whole table", async () => {
    await db.execute(sql`ANALYZE TABLE missions`);
    const [plan] = (await db.execute(sql`EXPLAIN SELECT COUNT(*) FROM missions m JOIN floorplan_versions v ON v.id = m.version_id WHERE ${shiftScope({ from: FROM, to: TO, floorplanId: floorA })}`)) as unknown as [{ table: string; type: string; key: string | null }[]];
    const missionsStep = plan.find((row) => row.table === "m")!;
    // The start-time indexes, or the version index under a floorplan filter, serve the range; the planner picks by statistics.
    expect(["missions_started_idx", "missions_state_idx", "missions_version_idx"]).toContain(missionsStep.key);
    expect(missionsStep.type).toBe("range");
  });

  it("writes the same figures to CSV as to JSON", async () => {
    const summary: ShiftSummary = await shiftSummary(db, { from: FROM, to: TO, floorplanId: floorA });
    const lines = shiftSummaryCsv(summary).trimEnd().split("\r\n").map((l) => l.split(","));
    expect(lines[0]).toEqual([...SHIFT_CSV_COLUMNS]);
    expect(lines).toHaveLength(1 + summary.robots.length + 1);
    const rows = [...summary.robots.map((r) => ({ id: r.robotId, name: r.robotName, f: r as ShiftFigures })), { id: "", name: TOTALS_LABEL, f: summary.totals }];
    rows.forEach(({ id, name, f }, i) => {
      const cells = Object.fromEntries(SHIFT_CSV_COLUMNS.map((c, k) => [c, lines[i + 1][k]]));
      expect([cells.robot_id, cells.robot_name]).toEqual([id, name]);
      expect(Number(cells.started)).toBe(f.started);
      expect(Number(cells.reached)).toBe(f.reached);
      expect(Number(cells.aborted)).toBe(f.aborted);
      expect(Number(cells.failed)).toBe(f.failed);
      expect(Number(cells.active)).toBe(f.active);
      expect(Number(cells.under_way_s)).toBeCloseTo(f.underWayS, 3);
      if (f.medianReachS === null) expect(cells.median_reach_s).toBe("");
      else expect(Number(cells.median_reach_s)).toBeCloseTo(f.medianReachS, 3);
      expect(Number(cells.certainty_min)).toBeCloseTo(f.certaintyMin!, 3);
      for (const r of HOLD_REASONS) expect(Number(cells[`holds_${r}`])).toBe(f.holds[r]);
    });
  });
});
