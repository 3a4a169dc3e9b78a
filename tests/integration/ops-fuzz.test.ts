/**
 * The /ops commands under malformed input (issue 8, first part): fast-check throws wrongly
 * typed, missing, oversized, deeply nested and boundary-value payloads, unknown robot and
 * alert ids and NaN-like numbers (JSON turns them into null) at every dashboard command,
 * as an operator and as an admin. Each must be refused with the documented error, never an
 * internal one; the tables a command could touch must stay as they were; the socket stays
 * signed in; and a robot driven meanwhile gets every message acknowledged.
 */
import { ne, sql } from "drizzle-orm";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { events } from "../../db/schema";
import { OpsCommandSchemas, type OpsAck, type OpsCommandName } from "../../lib/protocol";
import { OPS_COMMAND_ROLES } from "../../server/ops-feed";
import { connectDashboard, connectRobot, helloPayload, sessionCookie, startTestServer, type TestServer } from "../support/fleet-server";

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), {}, { ops: true });
});

afterAll(async () => {
  await server.stop();
});

const COMMANDS = Object.keys(OpsCommandSchemas) as OpsCommandName[];

/** Values a careless or hostile dashboard might put in a field. */
const wild = fc.oneof(
  fc.anything({ maxDepth: 6, maxKeys: 8 }),
  fc.constantFrom(-1, 0, 1, 511, 512, 2 ** 31, 2 ** 53, -(2 ** 53), 1e308, -0, 0.5, NaN, Infinity, -Infinity, "", "1", "0x10", true, null),
  fc.double(),
  fc.string({ minLength: 2000, maxLength: 20_000 }),
  fc.array(fc.integer(), { minLength: 500, maxLength: 3000 }),
  fc.integer({ min: 50, max: 1500 }).map((depth) => {
    let v: unknown = 0;
    for (let i = 0; i < depth; i++) v = i % 2 ? { a: v } : [v];
    return v;
  }),
);

/** The robot ids a payload names: unknown ones, one registered hardware robot (offline), or anything. */
const robotIdOf = (real: string) => fc.oneof(fc.string({ minLength: 1, maxLength: 30 }).map((s) => `ghost-${s}`), fc.constant(real), fc.string({ minLength: 41, maxLength: 60 }), wild);

const field = (real: string) =>
  fc.oneof(
    fc.record({ robotId: robotIdOf(real) }),
    fc.record({ alertId: fc.oneof(fc.integer({ min: 10 ** 12, max: 2 ** 53 - 1 }), fc.integer({ min: -(2 ** 31), max: 0 }), wild) }),
    fc.record({ floorplanId: wild }),
    fc.record({ goal: fc.oneof(wild, fc.record({ row: fc.oneof(wild, fc.integer({ min: -2, max: 600 })), col: fc.oneof(wild, fc.integer({ min: -2, max: 600 })) }, { requiredKeys: [] })) }),
    fc.record({ row: fc.oneof(wild, fc.integer({ min: -2, max: 600 })), col: fc.oneof(wild, fc.integer({ min: -2, max: 600 })) }, { requiredKeys: [] }),
    fc.record({ heading: fc.oneof(wild, fc.constantFrom("N", "E", "S", "W", "n", "NE")) }),
    fc.record({ fault: fc.oneof(wild, fc.record({ kind: fc.oneof(wild, fc.constantFrom("kidnap", "stall", "drop", "drain")), seconds: wild, level: wild, row: wild, col: wild })) }),
  );

const boundary = fc.oneof(fc.integer({ min: -2, max: 600 }), fc.constantFrom(511, 512, 2 ** 31 - 1, 2 ** 53 - 1));

/** Well-typed fields with boundary values, so that the commands' own checks (unknown robot, off the plan, offline) are reached too. */
const wellTyped = (real: string) =>
  fc.record(
    {
      robotId: fc.oneof(fc.string({ minLength: 1, maxLength: 30 }).map((s) => `ghost-${s}`), fc.constant(real)),
      alertId: fc.oneof(fc.integer({ min: 10 ** 12, max: 2 ** 53 - 1 }), fc.integer({ min: -(2 ** 31), max: 0 })),
      floorplanId: fc.integer(),
      goal: fc.record({ row: boundary, col: boundary }),
      row: boundary,
      col: boundary,
      heading: fc.constantFrom("N", "E", "S", "W"),
      fault: fc.oneof(
        fc.record({ kind: fc.constant("kidnap"), row: boundary, col: boundary }),
        fc.record({ kind: fc.constant("stall"), seconds: fc.double({ min: -1, max: 700, noNaN: true }) }),
        fc.record({ kind: fc.constant("drop"), seconds: fc.double({ min: -1, max: 700, noNaN: true }) }),
        fc.record({ kind: fc.constant("drain"), level: fc.double({ min: -0.5, max: 1.5, noNaN: true }) }),
      ),
    },
    { requiredKeys: ["robotId", "alertId", "floorplanId"] },
  );

/** One payload: a wild value, an object assembled from near-miss fields, or a well-typed one. */
const payloadOf = (real: string) =>
  fc.oneof(wild, fc.array(field(real), { maxLength: 4 }).map((parts) => Object.assign({}, ...parts) as Record<string, unknown>), wellTyped(real));

/** What socket.io delivers of a payload: JSON, so NaN and ±Infinity arrive as null, -0 as 0. */
function overTheWire(payload: unknown): unknown {
  return payload === undefined ? undefined : JSON.parse(JSON.stringify(payload, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? null : v)) ?? "null");
}

/** Row counts and checksums of the tables a command could write, leaving out the bystander's own events. */
async function tables(bystander: string) {
  const [rows] = (await server.db.execute(sql`CHECKSUM TABLE missions, audit, alerts, robots, beliefs`)) as unknown as [{ Table: string; Checksum: number | null }[]];
  const [[ev]] = (await server.db.execute(
    sql`SELECT COUNT(*) AS n, COALESCE(BIT_XOR(CRC32(CONCAT_WS('|', id, robot_id, COALESCE(seq, ''), source, kind, payload))), 0) AS crc FROM ${events} WHERE ${ne(events.robotId, bystander)}`,
  )) as unknown as [{ n: number; crc: string }[]];
  return { checksums: rows.map((r) => `${r.Table.split(".").pop()}=${r.Checksum}`), events: `${ev.n}/${ev.crc}` };
}

describe("/ops command fuzz", () => {
  it("refuses every malformed command with its documented error, changes nothing, and keeps serving a robot", async () => {
    const target = await server.addRobot({ name: "Fuzz target" });
    const sockets = {
      admin: await connectDashboard(server.url, await sessionCookie(server.db, "admin")),
      operator: await connectDashboard(server.url, await sessionCookie(server.db, "operator")),
    };
    const bystander = await server.addRobot({ name: "Fuzz bystander" });
    const robot = await connectRobot(server.url, { robot: bystander.id, key: bystander.key });
    await robot.call("hello", helloPayload(1));
    let seq = 1;
    const robotAcks: { ok: boolean }[] = [];
    const inFlight = new Set<Promise<unknown>>();
    const beating = setInterval(() => {
      const call = robot.call("beat", { seq: ++seq, at: Date.now(), battery: 0.8, status: "ok" }).then((a) => robotAcks.push(a));
      inFlight.add(call);
      void call.finally(() => inFlight.delete(call));
    }, 50);
    await expect.poll(() => robotAcks.length).toBeGreaterThan(0);
    const before = await tables(bystander.id);

    const seen = new Map<string, number>();
    try {
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...COMMANDS), fc.constantFrom("admin" as const, "operator" as const), payloadOf(target.id), async (name, as, raw) => {
          const payload = overTheWire(raw);
          const parsed = OpsCommandSchemas[name].safeParse(payload);
          // A well-formed hold or relocate of the registered robot would (rightly) be carried out.
          fc.pre(!(parsed.success && (name === "hold" || name === "relocate") && (parsed.data as { robotId: string }).robotId === target.id));
          const ack = (await sockets[as].call(name, raw)) as OpsAck;
          const allowed = as === "admin" || OPS_COMMAND_ROLES[name] !== "admin";
          let expected: string;
          if (!allowed) expected = `forbidden:${name}`;
          else if (!parsed.success) expected = `bad_request:${name}`;
          else if (name === "watch") expected = "ok";
          else if (name === "ackAlert") expected = "not_found:ackAlert";
          else if ((parsed.data as { robotId: string }).robotId === target.id) expected = `unprocessable:${name}`;
          else expected = "not_found:robot";
          const got = ack.ok ? "ok" : ack.error.code;
          seen.set(expected, (seen.get(expected) ?? 0) + 1);
          expect(got, JSON.stringify(ack).slice(0, 300)).toBe(expected);
          if (!ack.ok) {
            expect(ack.error.message).toEqual(expect.any(String));
            if (expected.startsWith("bad_request")) expect(Object.keys(ack.error.fields ?? {}).length).toBeGreaterThan(0);
          }
          expect(sockets[as].connected).toBe(true);
          expect(await tables(bystander.id)).toEqual(before);
        }),
        { numRuns: 400, seed: 20261202 },
      );
    } finally {
      clearInterval(beating);
      await Promise.all(inFlight);
    }
    console.log(`/ops fuzz outcomes: ${JSON.stringify(Object.fromEntries(seen))}`);
    // Every kind of refusal came up, not only the schema's.
    for (const kind of ["forbidden", "bad_request", "not_found", "unprocessable"]) expect([...seen.keys()].some((k) => k.startsWith(kind)), kind).toBe(true);
    await expect.poll(() => robotAcks.length, { timeout: 5000 }).toBeGreaterThan(20);
    expect(robotAcks.every((a) => a.ok)).toBe(true);
    // Still signed in and answering: a well-formed watch works.
    expect(await sockets.operator.call("watch", { floorplanId: 1 })).toMatchObject({ ok: true });
    robot.close();
    sockets.admin.close();
    sockets.operator.close();
  });
});
