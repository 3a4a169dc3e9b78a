/** Heartbeats (issue 4, PROTOCOL.md "beat"): silence makes a robot offline and holds its mission; a hello brings it back. */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { robotState } from "../../server/fleet/frames";
import { connectRobot, helloPayload, scriptedRobot, startTestServer, type TestServer } from "../support/fleet-server";

let server: TestServer;
const actor = { userId: null, label: "test" };

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { heartbeatTimeoutMs: 800 });
});

afterAll(async () => {
  await server.stop();
});

describe("heartbeats", () => {
  it("holds a silent robot's mission as offline and resumes it after the next hello", async () => {
    const scripted = await scriptedRobot(server);
    const runtime = () => server.fleet.robots.get(scripted.robot.id)!;
    await server.fleet.relocate(scripted.robot.id, { row: 10, col: 12, heading: "W" }, actor);
    const mission = await server.fleet.dispatch(scripted.robot.id, { row: 10, col: 3 }, actor);
    await expect.poll(() => scripted.nexts.length).toBe(1);
    scripted.socket.close();

    await expect.poll(() => runtime().hold, { timeout: 3000 }).toBe("offline");
    expect(robotState(runtime())).toBe("offline");

    const back = await connectRobot(server.url, { robot: scripted.robot.id, key: scripted.robot.key });
    const resent: number[] = [];
    back.on("next", (m: { step: number }) => resent.push(m.step));
    expect(await back.call("hello", helloPayload(scripted.nextSeq()))).toMatchObject({ ok: true, state: "under_way", mission: { id: mission.id } });
    expect(runtime().hold).toBeNull();
    // The pending step is sent again, with the same step number, so the robot can tell it apart from a new one.
    await expect.poll(() => resent, { timeout: 2000 }).toEqual([1]);
    // Leave the floor clear for the other suites: an abandoned mission would hold its tiles.
    await server.fleet.cancel(scripted.robot.id, actor);
    back.close();
  });

  it("keeps an idle robot that beats online", async () => {
    const robot = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: robot.id, key: robot.key });
    let seq = 1;
    await socket.call("hello", helloPayload(seq));
    for (const battery of [0.9, 0.8, 0.7, 0.6]) {
      await new Promise((resolve) => setTimeout(resolve, 400));
      await socket.call("beat", { seq: ++seq, at: Date.now(), battery, status: "ok" });
    }
    expect(server.fleet.robots.get(robot.id)).toMatchObject({ online: true, battery: 0.6 });
    socket.close();
  });
});
