/**
 * The floorplan routes against the running server (issue 6): every action for every role,
 * imports of good and bad images and grids, the size limits, kept originals, numbered
 * immutable versions, exports that read back through lib/floorplan, and the audit trail.
 */
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { audit, floorplanUploads, users } from "../../db/schema";
import { parseFloorplan } from "../../lib/floorplan";
import { floorplanFromJson } from "../../lib/floorplan/json";
import { pngClaiming, pngOfLines } from "../support/png";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const tag = `${process.pid}-${Date.now() % 100000}`;
let db: Db;
const cookies: Record<"admin" | "operator" | "viewer" | "nobody", string> = { admin: "", operator: "", viewer: "", nobody: "" };

type Who = keyof typeof cookies;

interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string[]> };
}

async function call(who: Who, path: string, init: RequestInit = {}) {
  const res = await fetch(`${appUrl}${path}`, { ...init, headers: { ...(init.headers as Record<string, string>), cookie: cookies[who] } });
  const type = res.headers.get("content-type") ?? "";
  const body = type.includes("json") ? await res.json() : await res.text();
  return { status: res.status, body, headers: res.headers };
}

function upload(file: { bytes: Uint8Array | string; filename: string; type?: string }, fields: Record<string, string>) {
  const form = new FormData();
  form.set("file", new Blob([typeof file.bytes === "string" ? file.bytes : new Uint8Array(file.bytes)], { type: file.type ?? "application/octet-stream" }), file.filename);
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  return { method: "POST", body: form };
}

function postJson(body: unknown) {
  return { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } };
}

const LAB = ["##########", "#........#", "#..##....#", "#......#.#", "##########"];
const CSV = "1,1,1,1\n1,0,0,1\n1,0,0,1\n1,1,1,1\n";

beforeAll(async () => {
  db = openDb(inject("databaseUrl"));
  cookies.admin = await signInAs(appUrl, "admin@tessera.test");
  cookies.operator = await signInAs(appUrl, "operator@tessera.test");
  cookies.viewer = await signInAs(appUrl, "viewer@tessera.test");
});

afterAll(async () => {
  await closeDb();
});

describe("roles", () => {
  it("lets any signed-in user list and read floorplans, and nobody else", async () => {
    expect((await call("nobody", "/api/floorplans")).status).toBe(401);
    const list = await call("viewer", "/api/floorplans");
    expect(list.status).toBe(200);
    const demo = (list.body as { floorplans: { id: number; name: string; rows: number; cols: number; version: number; robots: { name: string }[] }[] }).floorplans.find((f) => f.name === "North Annex lab");
    expect(demo).toMatchObject({ rows: 20, cols: 30, version: 1 });
    const detail = await call("operator", `/api/floorplans/${demo!.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body).toMatchObject({ floorplan: { id: demo!.id, version: 1, rows: 20, cols: 30 }, versions: [{ version: 1 }] });
    expect((await call("nobody", `/api/floorplans/${demo!.id}`)).status).toBe(401);
  });

  it("refuses imports and new versions to viewers and operators with 403 and a clear error", async () => {
    const list = (await call("viewer", "/api/floorplans")).body as { floorplans: { id: number }[] };
    const id = list.floorplans[0].id;
    for (const who of ["viewer", "operator"] as const) {
      const imported = await call(who, "/api/floorplans", upload({ bytes: CSV, filename: "room.csv" }, { name: `Refused ${who} ${tag}`, tileM: "0.3" }));
      expect(imported.status).toBe(403);
      expect(imported.body).toEqual({ error: { code: "forbidden:floorplans", message: `This needs the admin role; you are ${who}.` } });
      const saved = await call(who, `/api/floorplans/${id}/versions`, postJson({ note: "x", plan: { rows: 1, cols: 1, tileM: 0.3, blocked: ["0"] } }));
      expect(saved.status).toBe(403);
      expect((saved.body as ErrorBody).error).toEqual({ code: "forbidden:floorplan", message: `This needs the admin role; you are ${who}.` });
      const preview = await call(who, "/api/floorplans/preview", upload({ bytes: CSV, filename: "room.csv" }, { tileM: "0.3" }));
      expect(preview.status).toBe(403);
      expect((await call(who, `/api/floorplans/${id}/original?version=1`)).status).toBe(403);
    }
    expect((await call("nobody", "/api/floorplans", upload({ bytes: CSV, filename: "room.csv" }, { name: `Anon ${tag}`, tileM: "0.3" }))).status).toBe(401);
    expect((await call("viewer", "/api/floorplans")).body).not.toMatchObject({ floorplans: expect.arrayContaining([expect.objectContaining({ name: `Refused viewer ${tag}` })]) });
  });
});

describe("import", () => {
  it("imports a PNG, keeps the original byte for byte, and writes the audit row", async () => {
    const png = pngOfLines(LAB, 4);
    const name = `PNG lab ${tag}`;
    const res = await call("admin", "/api/floorplans", upload({ bytes: png, filename: "lab.png", type: "image/png" }, { name, tileM: "0.25", pixelsPerTile: "4", threshold: "128" }));
    expect(res.status).toBe(201);
    const floorplan = (res.body as { floorplan: { id: number; versionId: number; rows: number; cols: number; tileM: number; version: number } }).floorplan;
    expect(floorplan).toMatchObject({ name, rows: 5, cols: 10, tileM: 0.25, version: 1 });
    const detail = (await call("viewer", `/api/floorplans/${floorplan.id}`)).body as { floorplan: { blocked: number[] }; versions: { upload: unknown; note: string }[] };
    expect(detail.floorplan.blocked.slice(20, 30)).toEqual([1, 0, 0, 1, 1, 0, 0, 0, 0, 1]);
    expect(detail.versions[0]).toMatchObject({ note: "Imported from lab.png", upload: { filename: "lab.png", mime: "image/png", size: png.length } });
    const kept = (await db.select().from(floorplanUploads).where(eq(floorplanUploads.versionId, floorplan.versionId)))[0];
    expect(Buffer.compare(kept.bytes, png)).toBe(0);
    const original = await fetch(`${appUrl}/api/floorplans/${floorplan.id}/original?version=1`, { headers: { cookie: cookies.admin } });
    expect(original.status).toBe(200);
    expect(Buffer.compare(Buffer.from(await original.arrayBuffer()), png)).toBe(0);
    const [admin] = await db.select({ id: users.id }).from(users).where(eq(users.email, "admin@tessera.test"));
    const rows = await db.select().from(audit).where(and(eq(audit.action, "floorplan.imported"), eq(audit.target, `floorplan:${floorplan.id}`)));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ userId: admin.id, detail: expect.objectContaining({ filename: "lab.png", kind: "png", pixelsPerTile: 4, rows: 5, cols: 10 }) });
  });

  it("the threshold decides which grey tiles are blocked, in the preview and the import alike", async () => {
    const png = pngOfLines(["#.", ".#"], 2, { dark: 100, light: 200 });
    const at = async (threshold: string) =>
      ((await call("admin", "/api/floorplans/preview", upload({ bytes: png, filename: "grey.png" }, { tileM: "0.3", pixelsPerTile: "2", threshold }))).body as { preview: { blocked: string[]; freeTiles: number } }).preview;
    expect(await at("90")).toMatchObject({ blocked: ["00", "00"], freeTiles: 4 });
    expect(await at("150")).toMatchObject({ blocked: ["10", "01"], freeTiles: 2 });
    const all = await call("admin", "/api/floorplans/preview", upload({ bytes: png, filename: "grey.png" }, { tileM: "0.3", pixelsPerTile: "2", threshold: "250" }));
    expect(all.status).toBe(422);
    expect((all.body as ErrorBody).error.message).toMatch(/no free tile/);
  });

  it("imports a CSV grid with annotations and a PGM image", async () => {
    const csv = await call("admin", "/api/floorplans", upload({ bytes: "0,0,1\n0,0,0\n---\n2,.,.\nD,.,X\n", filename: "bay.csv", type: "text/csv" }, { name: `CSV bay ${tag}`, tileM: "0.3048" }));
    expect(csv.status).toBe(201);
    const id = (csv.body as { floorplan: { id: number } }).floorplan.id;
    const detail = (await call("viewer", `/api/floorplans/${id}`)).body as { floorplan: { blocked: number[]; mark: number[]; dock: number[]; nogo: number[] } };
    expect(detail.floorplan).toMatchObject({ blocked: [0, 0, 1, 0, 0, 0], mark: [2, 0, 0, 0, 0, 0], dock: [0, 0, 0, 1, 0, 0], nogo: [0, 0, 0, 0, 0, 1] });
    const pgm = Buffer.concat([Buffer.from("P5\n4 2\n255\n"), Buffer.from([0, 255, 255, 0, 255, 255, 0, 255])]);
    const imported = await call("admin", "/api/floorplans", upload({ bytes: pgm, filename: "scan.pgm", type: "image/x-portable-graymap" }, { name: `PGM scan ${tag}`, tileM: "0.5" }));
    expect(imported.status).toBe(201);
    expect((imported.body as { floorplan: unknown }).floorplan).toMatchObject({ rows: 2, cols: 4, tileM: 0.5 });
  });

  it("refuses bad files with the status and a message that says what and where", async () => {
    const cases: { file: Parameters<typeof upload>[0]; fields?: Record<string, string>; status: number; message: RegExp; field?: string }[] = [
      { file: { bytes: "0,0,0\n0,0\n0,0,0\n", filename: "ragged.csv" }, status: 422, message: /ragged\.csv: ragged row: 2 cells where row 0 has 3 at line 2, row 1, col 2/, field: "file" },
      { file: { bytes: "1,1\n1,1\n", filename: "walls.csv" }, status: 422, message: /walls\.csv: no free tile/, field: "file" },
      { file: { bytes: "0,0,q\n", filename: "odd.txt" }, status: 422, message: /unknown symbol "q".*line 1, row 0, col 2/ },
      { file: { bytes: "just some notes, not a grid", filename: "notes.png", type: "image/png" }, status: 415, message: /notes\.png is not a PNG or PGM image/ },
      { file: { bytes: new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46]), filename: "photo.jpg", type: "image/jpeg" }, status: 415, message: /not a PNG or PGM image/ },
      { file: { bytes: new Uint8Array([0, 159, 146, 150, 0xff, 0xfe]), filename: "blob.bin" }, status: 415, message: /neither a PNG or PGM image nor a UTF-8 CSV\/text grid/ },
      { file: { bytes: pngOfLines(LAB, 4).subarray(0, 60), filename: "cut.png" }, fields: { pixelsPerTile: "4" }, status: 422, message: /cut\.png: image does not decode/ },
      { file: { bytes: pngOfLines(LAB, 4), filename: "lab.png" }, fields: { pixelsPerTile: "3" }, status: 422, message: /40 × 20 px is not a whole number of 3-pixel tiles at field PNG IHDR, byte 16/ },
      { file: { bytes: pngOfLines(["#".repeat(600)], 1), filename: "long.png" }, status: 422, message: /600 cols are over the 512 × 512 limit|over the 512 × 512 limit/ },
      { file: { bytes: "", filename: "empty.csv" }, status: 422, message: /empty/ },
      { file: { bytes: CSV, filename: "room.csv" }, fields: { tileM: "-1" }, status: 400, message: /not valid/, field: "tileM" },
      { file: { bytes: CSV, filename: "room.csv" }, fields: { name: "" }, status: 400, message: /not valid/, field: "name" },
    ];
    for (const c of cases) {
      const res = await call("admin", "/api/floorplans", upload(c.file, { name: `Bad ${c.file.filename} ${tag}`, tileM: "0.3", ...c.fields }));
      expect({ file: c.file.filename, status: res.status }).toEqual({ file: c.file.filename, status: c.status });
      const body = res.body as ErrorBody;
      expect(body.error.message).toMatch(c.message);
      expect(body.error.code).toMatch(/^(unprocessable|unsupported|bad_request):floorplans$/);
      if (c.field) expect(Object.keys(body.error.fields ?? {})).toContain(c.field);
    }
    const names = ((await call("admin", "/api/floorplans")).body as { floorplans: { name: string }[] }).floorplans.map((f) => f.name);
    expect(names.filter((n) => n.startsWith("Bad "))).toEqual([]);
  });

  it("refuses a PNG whose header announces 100000 × 100000 pixels before decoding it", async () => {
    const huge = pngClaiming(pngOfLines(LAB, 4), 100_000, 100_000);
    const started = Date.now();
    const res = await call("admin", "/api/floorplans", upload({ bytes: huge, filename: "huge.png", type: "image/png" }, { name: `Huge ${tag}`, tileM: "0.3", pixelsPerTile: "200" }));
    expect(res.status).toBe(422);
    expect((res.body as ErrorBody).error.message).toBe("huge.png: image of 100000 × 100000 px is over the 16,777,216-pixel limit at field PNG IHDR, byte 16.");
    // Decoding 10^10 pixels would take minutes and 40 GB; the header check answers at once.
    expect(Date.now() - started).toBeLessThan(2000);
    const plain = await call("admin", "/api/floorplans", upload({ bytes: pngClaiming(pngOfLines(LAB, 4), 100_000, 100_000), filename: "huge.png" }, { name: `Huge 1 ${tag}`, tileM: "0.3" }));
    expect((plain.body as ErrorBody).error.message).toMatch(/over the 16,777,216-pixel limit/);
  });

  it("refuses a file over the size limit with 413 and a duplicate name with 409", async () => {
    const big = new Uint8Array(3 * 1024 * 1024).fill(0x30);
    const res = await call("admin", "/api/floorplans", upload({ bytes: big, filename: "big.csv" }, { name: `Big ${tag}`, tileM: "0.3" }));
    expect(res.status).toBe(413);
    expect(res.body).toEqual({ error: { code: "too_large:floorplans", message: "The upload is larger than the 2 MB limit.", fields: { file: ["file too large"] } } });
    const first = await call("admin", "/api/floorplans", upload({ bytes: CSV, filename: "room.csv" }, { name: `Twice ${tag}`, tileM: "0.3" }));
    expect(first.status).toBe(201);
    const again = await call("admin", "/api/floorplans", upload({ bytes: CSV, filename: "room.csv" }, { name: `Twice ${tag}`, tileM: "0.3" }));
    expect(again.status).toBe(409);
    expect((again.body as ErrorBody).error).toMatchObject({ code: "conflict:floorplans", message: `A floorplan named "Twice ${tag}" already exists.` });
    const json = await call("admin", "/api/floorplans", { method: "POST", body: JSON.stringify({ name: "x" }), headers: { "content-type": "application/json" } });
    expect(json.status).toBe(415);
  });
});

describe("versions and exports", () => {
  it("numbers new versions, never changes an old one, audits each save and exports what it stores", async () => {
    const created = await call("admin", "/api/floorplans", upload({ bytes: CSV, filename: "room.csv" }, { name: `Versions ${tag}`, tileM: "0.4" }));
    const id = (created.body as { floorplan: { id: number } }).floorplan.id;
    const v2plan = { rows: 4, cols: 5, tileM: 0.4, blocked: ["11111", "10001", "10001", "11111"], mark: ["00000", "03000", "00000", "00000"], dock: [{ row: 2, col: 3 }] };
    const v2 = await call("admin", `/api/floorplans/${id}/versions`, postJson({ note: "wider room", plan: v2plan }));
    expect(v2.status).toBe(201);
    expect(v2.body).toMatchObject({ version: { version: 2, rows: 4, cols: 5, note: "wider room", createdBy: expect.any(String), upload: null } });
    const v3 = await call("admin", `/api/floorplans/${id}/versions`, postJson({ note: "dock moved", plan: { ...v2plan, dock: [{ row: 1, col: 3 }] } }));
    expect((v3.body as { version: { version: number } }).version.version).toBe(3);

    const first = (await call("viewer", `/api/floorplans/${id}?version=1`)).body as { floorplan: { rows: number; cols: number; blocked: number[]; version: number } };
    expect(first.floorplan).toMatchObject({ version: 1, rows: 4, cols: 4, blocked: [1, 1, 1, 1, 1, 0, 0, 1, 1, 0, 0, 1, 1, 1, 1, 1] });
    const latest = (await call("viewer", `/api/floorplans/${id}`)).body as { floorplan: { version: number; dock: number[] }; versions: { version: number; note: string }[] };
    expect(latest.floorplan.version).toBe(3);
    expect(latest.versions.map((v) => [v.version, v.note])).toEqual([
      [3, "dock moved"],
      [2, "wider room"],
      [1, "Imported from room.csv"],
    ]);
    expect((await call("viewer", `/api/floorplans/${id}?version=9`)).status).toBe(404);
    expect((await call("viewer", "/api/floorplans/999999")).status).toBe(404);
    expect((await call("viewer", "/api/floorplans/abc")).status).toBe(400);

    const saves = await db.select().from(audit).where(and(eq(audit.action, "floorplan.saved"), eq(audit.target, `floorplan:${id}`)));
    expect(saves.map((a) => (a.detail as { version: number }).version).sort()).toEqual([2, 3]);

    const csv = await call("viewer", `/api/floorplans/${id}/export?format=csv&version=2`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-disposition")).toContain(`tessera-versions-${tag}-v2.csv`);
    const fromCsv = parseFloorplan(csv.body as string, { tileM: 0.4 });
    expect(Array.from(fromCsv.blocked)).toEqual([1, 1, 1, 1, 1, 1, 0, 0, 0, 1, 1, 0, 0, 0, 1, 1, 1, 1, 1, 1]);
    expect(Array.from(fromCsv.mark)[6]).toBe(3);
    expect(Array.from(fromCsv.dock)[13]).toBe(1);
    const json = await call("viewer", `/api/floorplans/${id}/export?format=json`);
    const fromJson = floorplanFromJson(json.body);
    expect(fromJson.tileM).toBe(0.4);
    expect(Array.from(fromJson.dock)[8]).toBe(1);
    expect({ ...fromCsv, dock: fromJson.dock }).toEqual(fromJson);
  });

  it("refuses a version that is not a valid grid, saying which field and tile, and keeps the versions as they were", async () => {
    const created = await call("admin", "/api/floorplans", upload({ bytes: CSV, filename: "room.csv" }, { name: `Invalid versions ${tag}`, tileM: "0.3" }));
    const id = (created.body as { floorplan: { id: number } }).floorplan.id;
    const markOnWall = await call("admin", `/api/floorplans/${id}/versions`, postJson({ note: "bad", plan: { rows: 2, cols: 2, tileM: 0.3, blocked: ["01", "00"], mark: ["01", "00"] } }));
    expect(markOnWall.status).toBe(422);
    expect((markOnWall.body as ErrorBody).error).toEqual({ code: "unprocessable:floorplan", message: "The floorplan is not valid: mark on a blocked tile at field mark, row 0, col 1.", fields: { "plan.mark": ["mark on a blocked tile"] } });
    const walls = await call("admin", `/api/floorplans/${id}/versions`, postJson({ note: "walls", plan: { rows: 1, cols: 2, tileM: 0.3, blocked: ["11"] } }));
    expect(walls.status).toBe(422);
    expect((walls.body as ErrorBody).error.fields).toEqual({ "plan.blocked": ["no free tile"] });
    const noNote = await call("admin", `/api/floorplans/${id}/versions`, postJson({ plan: { rows: 1, cols: 1, tileM: 0.3, blocked: ["0"] } }));
    expect(noNote.status).toBe(400);
    expect(Object.keys((noNote.body as ErrorBody).error.fields ?? {})).toEqual(["note"]);
    expect((await call("admin", "/api/floorplans/999999/versions", postJson({ note: "x", plan: { rows: 1, cols: 1, tileM: 0.3, blocked: ["0"] } }))).status).toBe(404);
    const detail = (await call("viewer", `/api/floorplans/${id}`)).body as { versions: unknown[] };
    expect(detail.versions).toHaveLength(1);
  });
});
