/**
 * The robot link under malformed input (issue 8, first part): fast-check throws wrongly
 * typed, deeply nested, oversized and boundary-value messages at every robot event, and
 * the link must answer each with a documented refusal code, store nothing it refused, keep
 * the connection, and keep serving another robot meanwhile.
 */
import { count, eq } from "drizzle-orm";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { events } from "../../db/schema";
import { ROBOT_EVENT_NAMES } from "../../lib/protocol";
import { connectRobot, helloPayload, startTestServer, type TestServer } from "../support/fleet-server";

const REFUSALS = ["bad_message", "too_large", "out_of_order", "no_mission", "rate_limited"];

let server: TestServer;

beforeAll(async () => {
  // The too-many-errors rule has its own test; here every refusal must be answered.
  server = await startTestServer(inject("databaseUrl"), { maxErrors: 1_000_000 });
});

afterAll(async () => {
  await server.stop();
});

async function stored(robotId: string): Promise<number> {
  const [{ n }] = await server.db.select({ n: count() }).from(events).where(eq(events.robotId, robotId));
  return n;
}

/** Values a careless or hostile robot might put in a field. */
const wild = fc.oneof(
  fc.anything({ maxDepth: 6, maxKeys: 8 }),
  fc.constantFrom(-1, 0, 2 ** 53, -(2 ** 53), 1e308, -0, "", "1", true, null),
  fc.string({ minLength: 2000, maxLength: 20_000 }),
  fc.array(fc.integer(), { minLength: 500, maxLength: 3000 }),
);

/** A message that is at most a near miss: right envelope, one or more fields replaced by wild values. */
const message = fc.record({
  event: fc.constantFrom(...ROBOT_EVENT_NAMES),
  payload: fc.oneof(
    wild,
    fc.record({ seq: fc.oneof(wild, fc.integer({ min: -5, max: 5 })), at: fc.oneof(wild, fc.constant(Date.now())) }, { requiredKeys: [] }),
    fc.dictionary(fc.constantFrom("seq", "at", "action", "readings", "battery", "status", "protocol", "sensors", "row", "col", "heading", "mission", "outcome"), wild),
  ),
});

describe("robot link fuzz", () => {
  it("refuses every malformed message with a documented code, stores nothing refused, and keeps serving another robot", async () => {
    const fuzzed = await server.addRobot();
    const socket = await connectRobot(server.url, { robot: fuzzed.id, key: fuzzed.key });
    await socket.call("hello", helloPayload(1));
    const bystander = await server.addRobot();
    const other = await connectRobot(server.url, { robot: bystander.id, key: bystander.key });
    await other.call("hello", helloPayload(1));
    // Every fifth fuzzed message travels beside a beat from the other robot, so how often
    // that robot is served is counted, not left to how fast the run happens to go.
    let otherSeq = 1;
    const otherAcks: unknown[] = [];
    let runs = 0;

    let refused = 0;
    await fc.assert(
      fc.asyncProperty(message, async ({ event, payload }) => {
        const before = await stored(fuzzed.id);
        const beside = runs++ % 5 === 0 ? other.call("beat", { seq: ++otherSeq, at: Date.now(), battery: 0.8, status: "ok" }) : null;
        const ack = (await socket.call(event, payload)) as { ok: boolean; code?: string; message?: string };
        if (beside) otherAcks.push(await beside);
        expect(typeof ack.ok).toBe("boolean");
        if (!ack.ok) {
          refused++;
          expect(REFUSALS).toContain(ack.code);
          expect(ack.message).toEqual(expect.any(String));
          expect(await stored(fuzzed.id)).toBe(before);
        }
        expect(socket.connected).toBe(true);
      }),
      { numRuns: 300, seed: 20261202 },
    );
    expect(otherAcks).toHaveLength(60);
    expect(otherAcks.every((a) => (a as { ok: boolean }).ok)).toBe(true);
    expect(refused).toBeGreaterThan(250);
    // Still a working link after all that: a well-formed beat is applied.
    const next = (await socket.call("hello", helloPayload(10_000))) as { lastSeq: number };
    expect(await socket.call("beat", { seq: next.lastSeq + 1, at: Date.now(), battery: 0.5, status: "ok" })).toMatchObject({ ok: true });
    socket.close();
    other.close();
  });
});
