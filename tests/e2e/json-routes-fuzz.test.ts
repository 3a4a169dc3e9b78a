/**
 * The JSON routes under malformed input (issue 8, first part): signed in as the admin,
 * fast-check sends every route that takes a query string or a JSON body wrongly typed,
 * missing, oversized, deeply nested and boundary values, unknown ids in the path, and
 * bodies that are not JSON at all. Every refusal must be a 4xx with the error shape
 * `{ error: { code, message, fields? } }` (never a 500, never HTML), the server must stay
 * healthy, and the tables must be unchanged. Bodies a route would rightly accept (an
 * invite, a new robot, a profile change) are left out: they are meant to change things.
 */
import { sql } from "drizzle-orm";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { z } from "zod";
import { closeDb, openDb, type Db } from "../../db/client";
import { InviteSchema, MePatchSchema, ResetRequestSchema } from "../../lib/crew/schemas";
import { OpsCommandSchemas } from "../../lib/protocol";
import { DigestRequestSchema } from "../../lib/protocol/reports";
import { RegisterRobotSchema } from "../../lib/roster/register";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
let db: Db;
let admin = "";
let realRobots: string[] = [];

beforeAll(async () => {
  db = openDb(inject("databaseUrl"));
  admin = await signInAs(appUrl, "admin@tessera.test");
  const [rows] = (await db.execute(sql`SELECT id FROM robots`)) as unknown as [{ id: string }[]];
  realRobots = rows.map((r) => r.id);
});

afterAll(async () => {
  for (const [route, counts] of seen) console.log(`${route}: ${JSON.stringify(Object.fromEntries(counts))}`);
  await closeDb();
});

const TABLES = sql`CHECKSUM TABLE missions, events, audit, alerts, robots, users, user_tokens, floorplans, floorplan_versions`;

async function checksums(): Promise<string[]> {
  const [rows] = (await db.execute(TABLES)) as unknown as [{ Table: string; Checksum: number | null }[]];
  return rows.map((r) => `${r.Table.split(".").pop()}=${r.Checksum}`);
}

/** Values a careless or hostile client might put in a field. */
const wild = fc.oneof(
  fc.anything({ maxDepth: 5, maxKeys: 6 }),
  fc.constantFrom(-1, 0, 1, 2 ** 31, 2 ** 53, -(2 ** 53), 1e308, -0, 0.5, "", "1", "0x10", true, null, "<script>", "2026-13-45T25:61:00Z"),
  fc.string({ minLength: 2000, maxLength: 20_000 }),
  fc.array(fc.integer(), { minLength: 200, maxLength: 2000 }),
  fc.integer({ min: 50, max: 1000 }).map((depth) => {
    let v: unknown = 0;
    for (let i = 0; i < depth; i++) v = i % 2 ? { a: v } : [v];
    return v;
  }),
);

/** Field names the routes use, so that near misses reach the schemas' inner checks. */
const KEYS = [
  "name", "email", "role", "password", "newPassword", "currentPassword", "disabled", "onCall", "drive", "sensors", "floorplanId", "simulated",
  "robotId", "goal", "row", "col", "heading", "kind", "seconds", "level", "wheel", "motion", "sensor", "sensing", "gains", "layers", "rows", "cols",
  "tileM", "note", "from", "to", "shift", "date", "cursor", "limit", "before", "after", "state", "robot", "q", "format", "version", "step", "retired",
  "actor", "action", "page", "size", "at", "day",
];

const queryValue = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.constantFrom("", "-1", "0", "1", "1.5", "1e308", "NaN", "Infinity", "0x10", "99999999999999999999", "2026-02-30", "2026-12-02T00:00:00Z", "true", "null", "[]", "%00", "active", "csv", "json"),
  fc.string({ minLength: 500, maxLength: 2000 }),
);
const queryOf = fc.dictionary(fc.oneof(fc.constantFrom(...KEYS), fc.string({ maxLength: 12 })), queryValue, { maxKeys: 6 });

/** A raw request body: JSON of a wild value or of near-miss fields, or text that is not JSON. */
const bodyOf = fc.oneof(
  { weight: 3, arbitrary: fc.dictionary(fc.constantFrom(...KEYS), wild, { maxKeys: 5 }).map((v) => ({ json: v as unknown })) },
  { weight: 2, arbitrary: wild.map((v) => ({ json: v })) },
  { weight: 1, arbitrary: fc.oneof(fc.constantFrom("", "{", "[1,", "undefined", "{\"a\":}", "\u0000"), fc.string({ maxLength: 200 })).map((text) => ({ text })) },
);

/** Path ids that exist nowhere: wrong types, out of range, too long. */
const ghostId = fc.oneof(fc.constantFrom("0", "-1", "abc", "1.5", "99999999", "99999999999999999999", "1e3", "%20", "ghost-robot"), fc.stringMatching(/^[a-z0-9-]{41,80}$/));
/** Path ids for reads: the seeded floorplan and mission 1 as well as ghosts. */
const readId = fc.oneof(fc.constant("1"), ghostId);

interface RouteCase {
  method: "GET" | "POST" | "PUT" | "PATCH";
  path: (id: string, id2: string) => string;
  ids: fc.Arbitrary<string>;
  /** A body this route would accept and act on; such bodies are not sent. */
  accepts?: (json: unknown) => boolean;
}

const valid = (schema: z.ZodType) => (json: unknown) => schema.safeParse(json).success;

const QUERY_ROUTES: Record<string, RouteCase> = {
  "GET /api/audit": { method: "GET", path: () => "/api/audit", ids: fc.constant("") },
  "GET /api/floorplans/[id]": { method: "GET", path: (id) => `/api/floorplans/${id}`, ids: readId },
  "GET /api/floorplans/[id]/export": { method: "GET", path: (id) => `/api/floorplans/${id}/export`, ids: readId },
  "GET /api/floorplans/[id]/original": { method: "GET", path: (id) => `/api/floorplans/${id}/original`, ids: readId },
  "GET /api/mail": { method: "GET", path: () => "/api/mail", ids: fc.constant("") },
  "GET /api/missions": { method: "GET", path: () => "/api/missions", ids: fc.constant("") },
  "GET /api/missions/[id]/events": { method: "GET", path: (id) => `/api/missions/${id}/events`, ids: readId },
  "GET /api/missions/[id]/export": { method: "GET", path: (id) => `/api/missions/${id}/export`, ids: readId },
  "GET /api/missions/[id]/replay": { method: "GET", path: (id) => `/api/missions/${id}/replay`, ids: readId },
  "GET /api/missions/[id]/photos/[photoId]": { method: "GET", path: (id, id2) => `/api/missions/${id}/photos/${id2}`, ids: readId },
  "GET /api/reports/shift": { method: "GET", path: () => "/api/reports/shift", ids: fc.constant("") },
  "GET /api/robots": { method: "GET", path: () => "/api/robots", ids: fc.constant("") },
};

const BODY_ROUTES: Record<string, RouteCase> = {
  "POST /api/auth-links/[token]": { method: "POST", path: (id) => `/api/auth-links/${id}`, ids: ghostId },
  "POST /api/auth-links/reset-request": { method: "POST", path: () => "/api/auth-links/reset-request", ids: fc.constant(""), accepts: valid(ResetRequestSchema) },
  "POST /api/floorplans/[id]/versions": { method: "POST", path: (id) => `/api/floorplans/${id}/versions`, ids: ghostId },
  "PATCH /api/me": { method: "PATCH", path: () => "/api/me", ids: fc.constant(""), accepts: valid(MePatchSchema) },
  "POST /api/missions": {
    method: "POST",
    path: () => "/api/missions",
    ids: fc.constant(""),
    accepts: (json) => {
      const parsed = OpsCommandSchemas.dispatch.safeParse(json);
      return parsed.success && realRobots.includes(parsed.data.robotId);
    },
  },
  "POST /api/missions/[id]/certainty": { method: "POST", path: (id) => `/api/missions/${id}/certainty`, ids: ghostId },
  "POST /api/reports/shift/digest": { method: "POST", path: () => "/api/reports/shift/digest", ids: fc.constant(""), accepts: valid(DigestRequestSchema) },
  "POST /api/robots": { method: "POST", path: () => "/api/robots", ids: fc.constant(""), accepts: valid(RegisterRobotSchema) },
  "POST /api/robots/[id]/fault": { method: "POST", path: (id) => `/api/robots/${id}/fault`, ids: ghostId },
  "POST /api/robots/[id]/relocate": { method: "POST", path: (id) => `/api/robots/${id}/relocate`, ids: ghostId },
  "PUT /api/robots/[id]/settings": { method: "PUT", path: (id) => `/api/robots/${id}/settings`, ids: ghostId },
  "PATCH /api/users/[id]": { method: "PATCH", path: (id) => `/api/users/${id}`, ids: ghostId },
  "POST /api/users": { method: "POST", path: () => "/api/users", ids: fc.constant(""), accepts: valid(InviteSchema) },
};

const RUNS = 30;

/** Status codes seen per route, printed at the end so a run shows what it reached. */
const seen = new Map<string, Map<string, number>>();

function tally(route: string, code: string): void {
  const counts = seen.get(route) ?? new Map<string, number>();
  counts.set(code, (counts.get(code) ?? 0) + 1);
  seen.set(route, counts);
}

/** The response is JSON; a refusal is a 4xx in the error shape. Reads may answer 200 (exports with their file). */
async function expectRefusalShape(res: Response, route: string, where: string, mayAccept: boolean): Promise<void> {
  const text = await res.text();
  let outcome = String(res.status);
  try {
    if (res.status >= 400) outcome = String((JSON.parse(text) as { error?: { code?: string } }).error?.code ?? outcome);
  } catch {
    outcome += " (not JSON)";
  }
  tally(route, outcome);
  const what = `${where} → ${res.status} ${text.slice(0, 200)}`;
  expect(res.status, what).toBeLessThan(500);
  if (res.status < 400) {
    expect(mayAccept, what).toBe(true);
    return;
  }
  expect(res.headers.get("content-type") ?? "", what).toContain("application/json");
  const body = JSON.parse(text) as { error?: { code?: unknown; message?: unknown; fields?: unknown } };
  expect(Object.keys(body), what).toEqual(["error"]);
  const { code, message, fields } = body.error ?? {};
  expect(code, what).toMatch(/^[a-z_]+:[a-zA-Z-]+$/);
  expect(String(code).startsWith("internal"), what).toBe(false);
  expect(message, what).toEqual(expect.any(String));
  expect(Object.keys(body.error!).every((k) => ["code", "message", "fields"].includes(k)), what).toBe(true);
  if (fields !== undefined) {
    expect(typeof fields, what).toBe("object");
    for (const list of Object.values(fields as Record<string, unknown>)) expect(Array.isArray(list) && list.every((m) => typeof m === "string"), what).toBe(true);
  }
}

async function healthy(): Promise<void> {
  const res = await fetch(`${appUrl}/api/health`);
  expect(res.status).toBe(200);
}

describe("JSON routes fuzz", () => {
  it.each(Object.entries(QUERY_ROUTES))("%s answers any query string without a 500", async (label, route) => {
    const before = await checksums();
    await fc.assert(
      fc.asyncProperty(route.ids, readId, queryOf, async (id, id2, query) => {
        const path = `${route.path(encodeURIComponent(id), encodeURIComponent(id2))}?${new URLSearchParams(query)}`;
        const res = await fetch(`${appUrl}${path}`, { headers: { cookie: admin } });
        await expectRefusalShape(res, label, `${label} ${path.slice(0, 200)}`, true);
      }),
      { numRuns: RUNS, seed: 20261202 },
    );
    await healthy();
    expect(await checksums()).toEqual(before);
  });

  it.each(Object.entries(BODY_ROUTES))("%s refuses malformed bodies with the error shape and changes nothing", async (label, route) => {
    const before = await checksums();
    await fc.assert(
      fc.asyncProperty(route.ids, bodyOf, async (id, body) => {
        fc.pre(!("json" in body) || !route.accepts?.(body.json));
        const text = "json" in body ? JSON.stringify(body.json) ?? "null" : body.text;
        const path = route.path(encodeURIComponent(id), "");
        const res = await fetch(`${appUrl}${path}`, { method: route.method, headers: { cookie: admin, "content-type": "application/json", origin: appUrl }, body: text });
        await expectRefusalShape(res, label, `${label} ${path.slice(0, 120)} ${text.slice(0, 120)}`, false);
      }),
      { numRuns: RUNS, seed: 20261202 },
    );
    await healthy();
    expect(await checksums()).toEqual(before);
  });
});
