/**
 * Fault: MariaDB stops for 20 s in the middle of missions and starts again. The server
 * acknowledges nothing it could not store, holds the robots whose messages it cannot
 * store (reason fault), keeps its memory flat meanwhile, and recovers by itself once the
 * database is back: robots released, their resent messages applied once, missions going on.
 */
import { and, eq, inArray } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { alerts, events } from "../../db/schema";
import {
  ERRANDS,
  expectNothingLost,
  missionSteps,
  outcomes,
  rssOf,
  sendOnMissions,
  sleep,
  useFaultScene,
} from "../support/fault-rig";

const OUTAGE_MS = 20_000;
/** A generous bound: the point is "flat", not a figure (the server refuses instead of queueing). */
const RSS_GROWTH_LIMIT = 64 * 1024 * 1024;


const scene = useFaultScene(200);

describe("database outage", () => {
  it("refuses what it cannot store, holds the robots, stays flat and recovers by itself", { timeout: 90_000 }, async () => {
    const db = scene.db;
    const server = scene.node;
    const ids = scene.robots.map((r) => r.id);
    await sendOnMissions(scene.dashboard, db.robots.map((robot) => ({ robot, goal: ERRANDS[robot.id] })));
    await expect.poll(() => Object.values(missionSteps(scene.dashboard, ids)).every((s) => s !== null && s >= 3), { timeout: 20_000, interval: 100 }).toBe(true);

    const rss: { at: number; bytes: number }[] = [];
    const sampler = setInterval(() => rss.push({ at: Date.now(), bytes: rssOf(server.child.pid!) }), 250);
    try {
      const stopping = Date.now();
      await db.stop();
      // The instance's shutdown blocked this process (spawnSync): let the acks it answered before it went down arrive first.
      await sleep(250);
      const downAt = Date.now();
      const baseline = rssOf(server.child.pid!);
      const before = missionSteps(scene.dashboard, ids);

      // Every robot is told to hold, and the dashboard shows why.
      await expect
        .poll(() => ids.filter((id) => !scene.dashboard.frames.some((f) => f.at >= stopping && f.frame.robotId === id && f.frame.holdReason === "fault")), { timeout: 10_000, interval: 100 })
        .toEqual([]);
      for (const r of scene.robots) expect(r.events.some((e) => e.kind === "hold" && e.detail.reason === "fault"), `${r.id} received hold (fault)`).toBe(true);
      await sleep(OUTAGE_MS - (Date.now() - downAt));

      const upAt = Date.now();
      const okWhileDown = scene.robots.flatMap((r) => r.acks.filter((a) => a.at > downAt && a.at < upAt && a.ack.ok).map((a) => `${r.id}#${a.seq}`));
      const refusedWhileDown = scene.robots.reduce((n, r) => n + r.acks.filter((a) => a.at > downAt && a.at < upAt && !a.ack.ok).length, 0);
      const peak = Math.max(...rss.filter((s) => s.at >= downAt && s.at <= upAt).map((s) => s.bytes));
      console.log(
        `outage ${upAt - downAt} ms: ${refusedWhileDown} messages refused, ${okWhileDown.length} acknowledged; RSS ${(baseline / 2 ** 20).toFixed(1)} MB at the start, peak ${(peak / 2 ** 20).toFixed(1)} MB`,
      );
      expect(okWhileDown).toEqual([]);
      expect(refusedWhileDown).toBeGreaterThan(0);
      expect(peak - baseline).toBeLessThan(RSS_GROWTH_LIMIT);
      expect(server.child.exitCode).toBeNull();
      const health = (await (await fetch(`${server.url}/api/health`)).json()) as { db: boolean };
      expect(health.db).toBe(false);

      await db.start();
      const startedAt = Date.now();
      // Released without anyone's help, then each mission reaches an outcome or keeps stepping.
      await expect.poll(() => ids.filter((id) => scene.dashboard.latest(id)?.holdReason === "fault"), { timeout: 15_000, interval: 100 }).toEqual([]);
      console.log(`robots released ${Date.now() - startedAt} ms after MariaDB was back`);
      await expect
        .poll(() => scene.robots.filter((r) => outcomes(r).length === 0 && (missionSteps(scene.dashboard, [r.id])[r.id] ?? 0) < (before[r.id] ?? 0) + 3).map((r) => r.id), { timeout: 20_000, interval: 200 })
        .toEqual([]);
      for (const r of scene.robots) expect(r.events.some((e) => e.kind === "release" && e.timeS >= 0), `${r.id} received release`).toBe(true);
      expect(server.child.exitCode).toBeNull();
    } finally {
      clearInterval(sampler);
    }
    await expectNothingLost(db.db, scene.dashboard, scene.robots);

    // The outage's holds are in the log once storage is back, where they happened, with an alert each.
    const logged = await db.db
      .select({ robotId: events.robotId, kind: events.kind, payload: events.payload })
      .from(events)
      .where(and(inArray(events.robotId, ids), eq(events.source, "server"), inArray(events.kind, ["hold", "release"])));
    for (const id of ids) {
      expect(logged.filter((e) => e.robotId === id && e.kind === "hold" && (e.payload as { why?: string }).why === "storage unavailable")).toHaveLength(1);
      expect(logged.filter((e) => e.robotId === id && e.kind === "release" && (e.payload as { reason?: string }).reason === "storage back")).toHaveLength(1);
    }
    const faultAlerts = await db.db.select({ robotId: alerts.robotId }).from(alerts).where(and(inArray(alerts.robotId, ids), eq(alerts.kind, "fault")));
    expect(faultAlerts.map((a) => a.robotId).sort()).toEqual([...ids].sort());
  });
});
