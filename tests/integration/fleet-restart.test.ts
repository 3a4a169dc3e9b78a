/**
 * A restarted server rebuilds each robot's belief from its last snapshot plus the events
 * after it (ARCHITECTURE.md, "Durability"), and the mission carries on.
 */
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, inject, it } from "vitest";
import { missions } from "../../db/schema";
import type { ServerMessage } from "../../lib/protocol";
import { connectRobot, helloPayload, scriptedRobot, startTestServer, type TestServer } from "../support/fleet-server";

let server: TestServer | undefined;

afterAll(async () => {
  await server?.stop();
});

describe("server restart", () => {
  it("rebuilds the same belief and resumes the mission", async () => {
    const url = inject("databaseUrl");
    server = await startTestServer(url, { snapshotEvery: 3 });
    const scripted = await scriptedRobot(server);
    const { robot, socket } = scripted;
    // Idle sensing before the mission; the readings stay fixed, only replay exactness matters here.
    const readings = [
      { sensor: "us-front", rangeM: 3 },
      { sensor: "us-left", rangeM: 0.46 },
      { sensor: "us-right", rangeM: 0.15 },
      { sensor: "floor", mark: 0 },
    ];
    for (let i = 0; i < 3; i++) await socket.call("sensed", { seq: scripted.nextSeq(), at: Date.now(), readings });
    await server.fleet.relocate(robot.id, { row: 10, col: 12, heading: "W" }, { userId: null, label: "test" });
    const mission = await server.fleet.dispatch(robot.id, { row: 10, col: 4 }, { userId: null, label: "test" });
    for (let step = 0; step < 4; step++) {
      expect(await scripted.step(readings)).toMatchObject({ mission: mission.id, step: step + 1 });
    }
    const before = Float64Array.from(server.fleet.robots.get(robot.id)!.filter.belief);
    const stepsBefore = server.fleet.robots.get(robot.id)!.mission!.step;
    socket.close();
    await server.stop();

    server = await startTestServer(url, { snapshotEvery: 3 });
    const rebuilt = server.fleet.robots.get(robot.id)!;
    let worst = 0;
    for (let i = 0; i < before.length; i++) worst = Math.max(worst, Math.abs(rebuilt.filter.belief[i] - before[i]));
    expect(worst).toBeLessThan(1e-12);
    let seq = scripted.lastSeq();
    expect(rebuilt.lastSeq).toBe(seq);
    expect(rebuilt.mission).toMatchObject({ id: mission.id, goal: { row: 10, col: 4 }, step: stepsBefore });

    const again = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    const resumed: ServerMessage["next"][] = [];
    again.on("next", (m: ServerMessage["next"]) => resumed.push(m));
    expect(await again.call("hello", helloPayload(++seq))).toMatchObject({ ok: true, lastSeq: seq, state: "under_way", mission: { id: mission.id } });
    await expect.poll(() => resumed.length, { timeout: 3000 }).toBeGreaterThan(0);
    expect(resumed[0].mission).toBe(mission.id);
    const [row] = await server.db.select().from(missions).where(eq(missions.id, mission.id));
    expect(row.state).toBe("active");
    await server.fleet.cancel(robot.id, { userId: null, label: "test" });
    again.close();
  });
});
