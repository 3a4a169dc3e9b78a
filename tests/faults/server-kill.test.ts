/**
 * Fault: the server is killed with SIGKILL in the middle of missions and started again on
 * the same port. The robots reconnect and resend what was not acknowledged, the missions
 * go on, and nothing acknowledged is lost or applied twice.
 */
import { describe, expect, it } from "vitest";
import {
  ERRANDS,
  expectNothingLost,
  missionSteps,
  outcomes,
  sendOnMissions,
  startFaultNode,
  unanswered,
  useFaultScene,
} from "../support/fault-rig";


const scene = useFaultScene(100);

describe("server killed mid-mission", () => {
  it("comes back on the same port; robots resend, missions go on, nothing is lost", { timeout: 60_000 }, async () => {
    const db = scene.db;
    const ids = scene.robots.map((r) => r.id);
    await sendOnMissions(scene.dashboard, db.robots.map((robot) => ({ robot, goal: ERRANDS[robot.id] })));
    await expect.poll(() => Object.values(missionSteps(scene.dashboard, ids)).every((s) => s !== null && s >= 4), { timeout: 20_000, interval: 100 }).toBe(true);

    const before = missionSteps(scene.dashboard, ids);
    const sentBefore = new Map(scene.robots.map((r) => [r.id, r.sim.client.lastSeq]));
    await scene.node.kill("SIGKILL");
    const killedAt = Date.now();
    scene.node = await startFaultNode(db.url);
    console.log(`server killed and healthy again after ${Date.now() - killedAt} ms; messages waiting in the robots: ${scene.robots.map((r) => r.sim.client.pending).join(", ")}`);

    await expect.poll(() => scene.robots.every((r) => r.sim.client.state === "online"), { timeout: 15_000, interval: 100 }).toBe(true);
    // Each mission reaches an outcome or takes more steps on the new server.
    await expect
      .poll(() => scene.robots.filter((r) => outcomes(r).length === 0 && (missionSteps(scene.dashboard, [r.id])[r.id] ?? 0) < (before[r.id] ?? 0) + 3).map((r) => r.id), { timeout: 30_000, interval: 200 })
      .toEqual([]);
    for (const r of scene.robots) expect(unanswered(r, sentBefore.get(r.id)!), `seqs of ${r.id} sent before the kill and never answered`).toEqual([]);
    console.log(`steps at the kill ${JSON.stringify(before)}; now ${JSON.stringify(missionSteps(scene.dashboard, ids))}; outcomes ${JSON.stringify(scene.robots.map(outcomes))}`);

    await expectNothingLost(db.db, scene.dashboard, scene.robots);
  });
});
