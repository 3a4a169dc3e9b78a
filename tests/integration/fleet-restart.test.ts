/**
 * A restarted server rebuilds each robot's belief from its last snapshot plus the events
 * after it (ARCHITECTURE.md, "Durability"), and the mission carries on.
 */
import { and, desc, eq } from "drizzle-orm";
import { afterAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb } from "../../db/client";
import { events, missions } from "../../db/schema";
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

  it("counts a step whose `next` the previous server sent but never stored", async () => {
    const url = inject("databaseUrl");
    server = await startTestServer(url);
    const scripted = await scriptedRobot(server);
    const { robot } = scripted;
    const readings = [{ sensor: "floor", mark: 0 }];
    await server.fleet.relocate(robot.id, { row: 13, col: 5, heading: "E" }, { userId: null, label: "test" });
    const mission = await server.fleet.dispatch(robot.id, { row: 13, col: 20 }, { userId: null, label: "test" });
    for (let step = 1; step <= 2; step++) expect(await scripted.step(readings)).toMatchObject({ step });
    await expect.poll(() => scripted.nexts.length).toBe(3);
    const carriedOut = scripted.nexts[2];
    scripted.socket.close();
    await server.stop();
    // What a node killed before its last batch commit leaves: step 3 was sent and carried
    // out, but neither its `next` nor the mission's step count reached the database.
    const db = openDb(url);
    const [lastNext] = await db.select({ id: events.id }).from(events).where(and(eq(events.robotId, robot.id), eq(events.kind, "next"))).orderBy(desc(events.id)).limit(1);
    await db.delete(events).where(eq(events.id, lastNext.id));
    await db.update(missions).set({ steps: 2 }).where(eq(missions.id, mission.id));
    await closeDb();

    server = await startTestServer(url);
    expect(server.fleet.robots.get(robot.id)!.mission).toMatchObject({ id: mission.id, step: 2 });
    const again = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    const resumed: ServerMessage["next"][] = [];
    again.on("next", (m: ServerMessage["next"]) => resumed.push(m));
    const seq = scripted.lastSeq();
    expect(await again.call("hello", helloPayload(seq + 1))).toMatchObject({ ok: true, state: "under_way" });
    // The robot reports the step it carried out while the link was down.
    expect(await again.call("moved", { seq: seq + 2, at: Date.now(), action: carriedOut.action })).toMatchObject({ ok: true });
    expect(await again.call("sensed", { seq: seq + 3, at: Date.now(), readings })).toMatchObject({ ok: true });
    await expect.poll(() => resumed.at(-1)?.step, { timeout: 3000 }).toBe(4);
    expect(server.fleet.robots.get(robot.id)!.mission?.step).toBe(4);
    await server.fleet.cancel(robot.id, { userId: null, label: "test" });
    again.close();
  });
});
