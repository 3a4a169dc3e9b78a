/**
 * A step the robot never reports done (PROTOCOL.md "The step cycle": every `next` is answered
 * by `moved`): while its beats keep the link up nothing else would notice, so the mission
 * would wait for ever. It is sent once more, then the robot is held with reason fault.
 */
import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { alerts } from "../../db/schema";
import { scriptedRobot, startTestServer, type TestServer } from "../support/fleet-server";

const actor = { userId: null, label: "test" };
let server: TestServer;

beforeAll(async () => {
  // The scripted robot sends no beats: a long heartbeat timeout keeps it online meanwhile.
  server = await startTestServer(inject("databaseUrl"), { stepTimeoutMs: 1000, heartbeatTimeoutMs: 60_000 });
});

afterAll(async () => {
  await server.stop();
});

describe("a step that goes unanswered", () => {
  it("is sent once more, then holds the robot with reason fault; a release sends it again and the mission goes on", async () => {
    const scripted = await scriptedRobot(server);
    const { robot } = scripted;
    const runtime = () => server.fleet.robots.get(robot.id)!;
    // Let the hello's own re-send pass first, so every copy below is the timeout's.
    await expect.poll(() => runtime().resumeAt, { timeout: 5000 }).toBeNull();
    await server.fleet.relocate(robot.id, { row: 10, col: 12, heading: "W" }, actor);
    const mission = await server.fleet.dispatch(robot.id, { row: 10, col: 4 }, actor);
    await expect.poll(() => scripted.nexts.length, { timeout: 10_000 }).toBe(1);
    const first = scripted.nexts[0];
    expect(first).toMatchObject({ mission: mission.id, step: 1 });

    await expect.poll(() => scripted.nexts.length, { timeout: 5000 }).toBe(2);
    expect(scripted.nexts[1]).toEqual(first);
    expect(runtime().hold).toBeNull();

    await expect.poll(() => runtime().hold, { timeout: 5000 }).toBe("fault");
    expect(scripted.nexts).toHaveLength(2);
    await expect
      .poll(async () => (await server.db.select({ message: alerts.message }).from(alerts).where(and(eq(alerts.robotId, robot.id), eq(alerts.kind, "fault"))).orderBy(desc(alerts.id)).limit(1))[0]?.message)
      .toContain("step 1 was sent twice and not reported done");

    await server.fleet.release(robot.id, actor);
    await expect.poll(() => scripted.nexts.length, { timeout: 5000 }).toBe(3);
    expect(scripted.nexts[2]).toEqual(first);
    expect((await scripted.step([{ sensor: "floor", mark: 0 }])).step).toBe(1);
    await expect.poll(() => scripted.nexts.at(-1)?.step, { timeout: 5000 }).toBe(2);
    expect(runtime().mission?.step).toBe(2);
    await server.fleet.cancel(robot.id, actor);
    scripted.socket.close();
  });
});
