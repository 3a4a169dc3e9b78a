/**
 * The load run in small (issue 8, part 4, regression check): four robots at 5 messages a
 * second for four seconds and two dashboards against an in-process server; every message
 * must be acknowledged and stored exactly once. The figures are printed; the full run and
 * its targets are `npm run load`.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { defaultFloorplanId } from "../../db/queries/floorplans";
import { formatReport, runLoad } from "../../scripts/load/run";
import { sessionCookie, startTestServer, TEST_SENSORS, type TestServer } from "../support/fleet-server";

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), {}, { ops: true });
});

afterAll(async () => {
  await server.stop();
});

describe("load, short run", () => {
  it("acknowledges and stores every message of four robots at 5 Hz while two dashboards watch", async () => {
    const robots = [];
    for (let i = 0; i < 4; i++) robots.push(await server.addRobot({ name: `Load ${i + 1}` }));
    const floorplanId = (await defaultFloorplanId(server.db))!;
    const cookies = [await sessionCookie(server.db, "operator"), await sessionCookie(server.db, "viewer")];
    const report = await runLoad({
      url: server.url,
      db: server.db,
      robots,
      sensors: TEST_SENSORS,
      floorplanId,
      ratePerRobot: 5,
      durationMs: 4000,
      dashboardCookies: cookies,
      sample: { "test process (server and load together)": process.pid },
    });
    console.log(formatReport(report));
    expect(report.sent).toBeGreaterThanOrEqual(4 * 5 * 3);
    expect(report.refused).toEqual({});
    expect(report.unacknowledged).toBe(0);
    expect(report.acked).toBe(report.sent);
    expect(report.stored).toEqual({ checked: report.acked, missing: 0, duplicated: 0 });
    expect(report.nothingLost).toBe(true);
    // Each beat reaches both dashboards as a frame.
    expect(report.framesMissed).toBe(0);
    expect(report.frameMs.count).toBeGreaterThanOrEqual(report.sent);
    // A sanity bound only: the target (p99 under 100 ms at 50 robots) is the load script's.
    expect(report.ackMs.p99).toBeLessThan(2000);
  });
});
