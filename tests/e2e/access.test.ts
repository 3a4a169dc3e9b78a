/**
 * The access matrix: the table in tests/support/access-table.ts checked against the route
 * files, pages and /ops commands that exist, then every row run as signed out, viewer,
 * operator and admin against the running server. Robot keys are tried as dashboard and
 * API credentials too.
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { io as connect, type Socket } from "socket.io-client";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb } from "../../db/client";
import { roleAllows } from "../../lib/roles";
import { ROLES, type Role } from "../../lib/vocabulary";
import { OPS_COMMAND_ROLES } from "../../server/ops-feed";
import { API_ROUTES, OPS_COMMANDS, PAGES, type ApiSample, type Least } from "../support/access-table";
import { insertTestRobot } from "../support/robot-fixtures";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const APP_DIR = path.resolve(import.meta.dirname, "../../app");
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"];

/** Who the matrix runs as: signed out, then each role with one session reused throughout. */
type Who = "signed out" | Role;
const WHO: Who[] = ["signed out", ...ROLES];
const cookies: Partial<Record<Who, string>> = {};

beforeAll(async () => {
  for (const role of ROLES) cookies[role] = await signInAs(appUrl, `${role}@tessera.test`);
});

afterAll(async () => {
  await closeDb();
});

/** The URL pattern of a file under app/: its folders, route groups left out. */
function urlPattern(file: string): string {
  const segments = path.dirname(file).split(path.sep).filter((s) => s !== "." && !/^\(.*\)$/.test(s));
  return `/${segments.join("/")}`;
}

function filesNamed(name: string): string[] {
  return (readdirSync(APP_DIR, { recursive: true }) as string[]).filter((f) => path.basename(f) === name).sort();
}

/** The HTTP methods a route file exports, read from its text. */
function exportedMethods(source: string): string[] {
  const found = new Set<string>();
  for (const m of source.matchAll(/export\s+(?:const|let|async\s+function|function)\s+([A-Z]+)\b/g)) found.add(m[1]);
  for (const m of source.matchAll(/export\s*\{([^}]*)\}/g)) for (const part of m[1].split(",")) found.add(part.trim().split(/\s+/).at(-1) ?? "");
  return [...found].filter((name) => METHODS.includes(name)).sort();
}

/** "route METHOD" for each side, so a difference names what is missing where. */
function routeKeys(): { onDisk: string[]; inTable: string[] } {
  const onDisk = filesNamed("route.ts").flatMap((file) => exportedMethods(readFileSync(path.join(APP_DIR, file), "utf8")).map((m) => `${urlPattern(file)} ${m}`));
  const inTable = Object.entries(API_ROUTES).flatMap(([route, methods]) => Object.keys(methods).map((m) => `${route} ${m}`));
  return { onDisk: onDisk.sort(), inTable: inTable.sort() };
}

const missing = (want: string[], have: string[]) => want.filter((k) => !have.includes(k));

/** What `who` must meet at a row whose least role is `least`. */
function expected(who: Who, least: Least): "allowed" | "unauthorized" | "forbidden" {
  if (least === "public") return "allowed";
  if (who === "signed out") return "unauthorized";
  return roleAllows(who, least) ? "allowed" : "forbidden";
}

/** `{ error: { code: "type:surface", message, fields? } }`, as ARCHITECTURE.md has it. */
function hasErrorShape(text: string): boolean {
  try {
    const body = JSON.parse(text) as { error?: { code?: unknown; message?: unknown } };
    return Object.keys(body).length === 1 && typeof body.error?.code === "string" && /^[a-z_]+:[\w-]+$/.test(body.error.code) && typeof body.error.message === "string";
  } catch {
    return false;
  }
}

async function request(method: string, sample: ApiSample, cookie?: string) {
  const headers: Record<string, string> = cookie ? { cookie } : {};
  let body: string | undefined;
  if (sample.body !== undefined) {
    headers["content-type"] = sample.contentType ?? "application/json";
    body = typeof sample.body === "string" ? sample.body : JSON.stringify(sample.body);
  }
  const res = await fetch(`${appUrl}${sample.path}`, { method, headers, body, redirect: "manual" });
  const text = await res.text();
  return { status: res.status, text };
}

/** Where a page sends the visitor, by HTTP redirect or by the refresh tag of a streamed one. */
function redirectTarget(res: Response, html: string): string | null {
  return res.headers.get("location") ?? /http-equiv="refresh" content="\d+;url=([^"]+)"/.exec(html)?.[1] ?? null;
}

function openOps(extra: { cookie?: string; auth?: Record<string, unknown> }): Promise<{ socket: Socket } | { refused: unknown }> {
  return new Promise((resolve) => {
    const socket = connect(`${appUrl}/ops`, {
      reconnection: false,
      transports: ["websocket"],
      auth: extra.auth,
      extraHeaders: { origin: appUrl, ...(extra.cookie ? { cookie: extra.cookie } : {}) },
    });
    socket.once("connect", () => resolve({ socket }));
    socket.once("connect_error", (err) => {
      socket.close();
      resolve({ refused: (err as Error & { data?: unknown }).data });
    });
  });
}

describe("the access table", () => {
  it("has a row for every route file's exported method, and none for a route or method that is gone", () => {
    const { onDisk, inTable } = routeKeys();
    expect(onDisk.length).toBeGreaterThan(40);
    expect(missing(onDisk, inTable), "routes on disk without a row in tests/support/access-table.ts").toEqual([]);
    expect(missing(inTable, onDisk), "rows in tests/support/access-table.ts without a route on disk").toEqual([]);
  });

  it("has a row for every page, and none for a page that is gone", () => {
    const onDisk = filesNamed("page.tsx").map(urlPattern).sort();
    const inTable = Object.keys(PAGES).sort();
    expect(onDisk.length).toBeGreaterThan(15);
    expect(missing(onDisk, inTable), "pages without a row").toEqual([]);
    expect(missing(inTable, onDisk), "rows without a page").toEqual([]);
  });

  it("has every /ops command with the least role the feed enforces", () => {
    expect(Object.fromEntries(Object.entries(OPS_COMMANDS).map(([name, row]) => [name, row.least]))).toEqual(OPS_COMMAND_ROLES);
  });
});

describe("the access matrix", () => {
  for (const who of WHO) {
    it(`answers every API route as the table says when ${who}`, async () => {
      const wrong: string[] = [];
      for (const [route, methods] of Object.entries(API_ROUTES)) {
        for (const [method, sample] of Object.entries(methods) as [string, ApiSample][]) {
          const { status, text } = await request(method, sample, cookies[who]);
          const want = expected(who, sample.least);
          const label = `${method} ${route} (${sample.least}) as ${who}: ${status} ${text.slice(0, 160)}`;
          if (want === "unauthorized" && !(status === 401 && /"code":"unauthorized:/.test(text))) wrong.push(label);
          if (want === "forbidden" && !(status === 403 && /"code":"forbidden:[^"]+","message":"This needs the /.test(text))) wrong.push(label);
          if (want === "allowed" && (status === 401 || status === 403 || status >= 500)) wrong.push(label);
          // Tessera's own refusals (not next-auth's redirects) carry the one error shape.
          if (!route.startsWith("/api/auth/") && status >= 400 && !hasErrorShape(text)) wrong.push(`${label} (not the error shape)`);
        }
      }
      expect(wrong).toEqual([]);
    });

    it(`opens every page as the table says when ${who}`, async () => {
      const wrong: string[] = [];
      for (const [page, sample] of Object.entries(PAGES)) {
        const res = await fetch(`${appUrl}${sample.path}`, { headers: cookies[who] ? { cookie: cookies[who] } : {}, redirect: "manual" });
        const html = await res.text();
        const target = redirectTarget(res, html);
        const toSignIn = target !== null && /^(https?:\/\/[^/]+)?\/sign-in/.test(target);
        const want = expected(who, sample.least);
        const label = `${page} (${sample.least}) as ${who}: ${res.status} → ${target ?? "no redirect"}`;
        if (want === "unauthorized" && !toSignIn) wrong.push(label);
        if (want === "forbidden" && !(res.status === 403 && html.includes("This page needs a role you do not have"))) wrong.push(label);
        if (want === "allowed" && (toSignIn || res.status === 403 || res.status >= 500)) wrong.push(label);
      }
      expect(wrong).toEqual([]);
    });
  }

  it("refuses a dashboard socket to the signed-out", async () => {
    expect(await openOps({})).toEqual({ refused: { code: "unauthorized" } });
  });

  for (const role of ROLES) {
    it(`answers every /ops command as the table says for a ${role}`, async () => {
      const opened = await openOps({ cookie: cookies[role] });
      if (!("socket" in opened)) throw new Error(`the ${role}'s socket was refused: ${JSON.stringify(opened.refused)}`);
      const wrong: string[] = [];
      try {
        for (const [name, row] of Object.entries(OPS_COMMANDS)) {
          const ack = (await opened.socket.timeout(5000).emitWithAck(name, row.payload)) as { ok: boolean; error?: { code: string } };
          const forbidden = !ack.ok && ack.error?.code.startsWith("forbidden") === true;
          if (forbidden === roleAllows(role, row.least)) wrong.push(`${name} (${row.least}) as ${role}: ${JSON.stringify(ack)}`);
        }
      } finally {
        opened.socket.close();
      }
      expect(wrong).toEqual([]);
    });
  }
});

describe("robot credentials", () => {
  it("cannot open the dashboard feed, neither as socket auth nor as a session cookie", async () => {
    const robot = await insertTestRobot(openDb(inject("databaseUrl")));
    expect(await openOps({ auth: { robot: robot.id, key: robot.key } })).toEqual({ refused: { code: "unauthorized" } });
    expect(await openOps({ cookie: `next-auth.session-token=${robot.key}` })).toEqual({ refused: { code: "unauthorized" } });
  });

  it("are no credential for the API", async () => {
    const robot = await insertTestRobot(openDb(inject("databaseUrl")));
    const attempts: Record<string, string>[] = [
      { authorization: `Bearer ${robot.key}` },
      { authorization: `Basic ${Buffer.from(`${robot.id}:${robot.key}`).toString("base64")}` },
      { cookie: `next-auth.session-token=${robot.key}` },
    ];
    for (const headers of attempts) {
      const res = await fetch(`${appUrl}/api/robots/${robot.id}`, { headers });
      expect(res.status, JSON.stringify(headers)).toBe(401);
      expect(await res.json()).toEqual({ error: { code: "unauthorized:robot", message: "Sign in first." } });
    }
  });
});
