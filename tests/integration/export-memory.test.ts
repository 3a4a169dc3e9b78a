/**
 * A long mission's export is streamed (issue 7): the live heap while 60 000 events are
 * written out stays far below the size of the export, so the events never sit in memory whole.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { events, missions } from "../../db/schema";
import { exportMissionEvents } from "../../server/logbook";

const EVENTS = 60_000;
let db: Db;
let missionId = 0;

const gc = (globalThis as { gc?: () => void }).gc;

function liveHeap(): number {
  gc?.();
  return process.memoryUsage().heapUsed;
}

beforeAll(async () => {
  process.env.DATABASE_URL = inject("databaseUrl");
  process.env.NEXTAUTH_SECRET = "tessera-integration-secret";
  db = openDb(inject("databaseUrl"));
  const robotId = `export-probe-${Date.now()}`;
  [{ id: missionId }] = await db.insert(missions).values({ robotId, versionId: 1, goalRow: 1, goalCol: 1, state: "reached", steps: EVENTS / 2 }).$returningId();
  const base = Date.now() - EVENTS * 100;
  for (let from = 0; from < EVENTS; from += 2000) {
    const rows = Array.from({ length: 2000 }, (_, i) => {
      const n = from + i;
      const sensed = n % 2 === 1;
      return {
        robotId,
        seq: n + 1,
        missionId,
        source: "robot" as const,
        kind: sensed ? "sensed" : "moved",
        payload: sensed
          ? { readings: [{ sensor: "us-front", rangeM: 1.25 + (n % 7) * 0.1 }, { sensor: "us-left", rangeM: 0.46 }, { sensor: "us-right", rangeM: 0.15 }, { sensor: "floor", mark: n % 5 }] }
          : { action: n % 6 === 0 ? "left" : "forward" },
        robotAt: base + n * 100,
        receivedAt: new Date(base + n * 100 + 3),
      };
    });
    await db.insert(events).values(rows);
  }
}, 120_000);

afterAll(async () => {
  await closeDb();
});

describe("mission export", () => {
  it("streams 60 000 events as CSV with the live heap growing by far less than the export's size", async () => {
    expect(gc, "the integration project runs node with --expose-gc").toBeTypeOf("function");
    const reader = exportMissionEvents(missionId, "csv").getReader();
    const baseline = liveHeap();
    let peak = 0;
    let bytes = 0;
    let lines = 0;
    let chunks = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      bytes += value.byteLength;
      for (const b of value) if (b === 10) lines++;
      if (++chunks % 10 === 0) peak = Math.max(peak, liveHeap() - baseline);
    }
    console.log(`export: ${lines} lines, ${(bytes / 1048576).toFixed(1)} MB in ${chunks} chunks; live heap grew at most ${(peak / 1048576).toFixed(2)} MB`);
    expect(lines).toBe(EVENTS + 1);
    expect(bytes).toBeGreaterThan(6 * 1048576);
    // Tessera's bound: one page of 500 events in flight, a few hundred kilobytes.
    expect(peak).toBeLessThan(bytes / 8);
  });

  it("streams the same events as JSON that parses to every one of them in order", async () => {
    const text = await new Response(exportMissionEvents(missionId, "json")).text();
    const parsed = JSON.parse(text) as { seq: number }[];
    expect(parsed).toHaveLength(EVENTS);
    expect(parsed.every((e, i) => e.seq === i + 1)).toBe(true);
  });
});
