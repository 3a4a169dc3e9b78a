/**
 * What the floorplan routes and pages do: list, detail, import from an upload, preview an
 * upload, save a version from the editor's JSON, export. Every grid that reaches the
 * database was parsed here by lib/floorplan, whatever the browser showed before.
 */
import { eq } from "drizzle-orm";
import { planFromVersion, versionById } from "../../db/queries/floorplans";
import { floorplans } from "../../db/schema";
import { floorplanToCsv, floorplanToJson, FloorplanParseError, floorplanFromJson, type Floorplan, type FloorplanJson } from "../../lib/floorplan";
import type { FloorplanSummary, FloorplanVersionInfo, FloorplanView, SaveVersionBody } from "../../lib/protocol";
import type { SessionUser } from "../auth/options";
import { appDb } from "../db";
import { isTesseraError, TesseraError } from "../errors";
import { floorplanView } from "../live-floor";
import { logger } from "../logger";
import { registry } from "../registry";
import { importFloorplan, latestVersions, saveVersion, uploadOfVersion, versionsOf } from "./store";
import { ImportFieldsSchema, ImportOptionsSchema } from "../../lib/protocol";
import { parseFields, parseUpload, readUploadForm, requireFreeTile } from "./upload";

function userIdOf(user: SessionUser | null): number | null {
  return user ? Number(user.id) : null;
}

/** The robots the running fleet has on each floorplan (none when the fleet is not running). */
function robotsByFloorplan(): Map<number, FloorplanSummary["robots"]> {
  const out = new Map<number, FloorplanSummary["robots"]>();
  for (const frame of registry().fleet?.frames() ?? []) {
    if (frame.floorplanId === null) continue;
    const list = out.get(frame.floorplanId) ?? [];
    list.push({ id: frame.robotId, name: frame.name, versionId: frame.versionId });
    out.set(frame.floorplanId, list);
  }
  return out;
}

/** Every floorplan with its latest version's size and the robots on it. */
export async function floorplanSummaries(): Promise<FloorplanSummary[]> {
  const robots = robotsByFloorplan();
  return (await latestVersions(appDb())).map(({ floorplan, version }) => ({
    id: floorplan.id,
    name: floorplan.name,
    isDefault: floorplan.isDefault === 1,
    version: version.version,
    versionId: version.id,
    rows: version.rows,
    cols: version.cols,
    tileM: version.tileM,
    updatedAt: version.createdAt.getTime(),
    robots: (robots.get(floorplan.id) ?? []).sort((a, b) => a.name.localeCompare(b.name)),
  }));
}

/** A floorplan id from a route segment; 400 when it is not a positive integer. */
export function floorplanIdParam(raw: string | undefined): number {
  const id = Number(raw);
  if (!raw || !Number.isInteger(id) || id <= 0) throw new TesseraError("bad_request", "floorplan", `"${raw ?? ""}" is not a floorplan id.`);
  return id;
}

/** The version whose number is `version` (the latest when omitted); 404 when there is none. */
async function versionRow(floorplanId: number, version?: number) {
  const db = appDb();
  const versions = await versionsOf(db, floorplanId);
  const info = version === undefined ? versions[0] : versions.find((v) => v.version === version);
  if (!info) throw new TesseraError("not_found", "floorplan", `There is no floorplan ${floorplanId}${version !== undefined ? ` version ${version}` : ""}.`);
  return { info, versions };
}

export interface FloorplanDetail {
  floorplan: FloorplanView;
  versions: FloorplanVersionInfo[];
  robots: FloorplanSummary["robots"];
}

/** A floorplan at one version (the latest by default), with every version and the robots on it. */
export async function floorplanDetail(floorplanId: number, version?: number): Promise<FloorplanDetail> {
  const { info, versions } = await versionRow(floorplanId, version);
  return { floorplan: await floorplanView(floorplanId, info.id), versions, robots: robotsByFloorplan().get(floorplanId) ?? [] };
}

/** Like floorplanDetail for a page: null when the id or version does not name a floorplan. */
export async function findFloorplanDetail(rawId: string, version?: number): Promise<FloorplanDetail | null> {
  const id = Number(rawId);
  if (!Number.isInteger(id) || id <= 0) return null;
  try {
    return await floorplanDetail(id, version);
  } catch (err) {
    if (isTesseraError(err) && err.type === "not_found") return null;
    throw err;
  }
}

/** Tells the running fleet that a floorplan has a new version; a failure there never undoes the save. */
async function tellFleet(floorplanId: number): Promise<void> {
  const fleet = registry().fleet;
  if (!fleet) return;
  try {
    await fleet.floorplanChanged(floorplanId);
  } catch (err) {
    logger.error({ err, floorplan: floorplanId }, "the fleet could not pick up the new floorplan version");
  }
}

/** POST /api/floorplans: a multipart upload becomes a floorplan with its first version, the original kept beside it. */
export async function importFloorplanUpload(req: Request, user: SessionUser | null) {
  const surface = "floorplans";
  const { file, fields } = await readUploadForm(req, surface);
  const opts = parseFields(ImportFieldsSchema, fields, surface);
  const { plan, kind } = parseUpload(file, opts, surface);
  const detail = kind === "text" ? { kind, tileM: opts.tileM } : { kind, tileM: opts.tileM, pixelsPerTile: opts.pixelsPerTile, threshold: opts.threshold };
  const { floorplanId } = await importFloorplan(appDb(), { name: opts.name, plan, note: opts.note ?? `Imported from ${file.filename}`, file, userId: userIdOf(user), detail });
  return { floorplan: (await floorplanSummaries()).find((f) => f.id === floorplanId) };
}

/** POST /api/floorplans/preview: the grid an upload would give, parsed exactly as the import will, stored nowhere. */
export async function previewFloorplanUpload(req: Request): Promise<{ preview: FloorplanJson & { freeTiles: number } }> {
  const surface = "floorplans";
  const { file, fields } = await readUploadForm(req, surface);
  const opts = parseFields(ImportOptionsSchema, fields, surface);
  const { plan } = parseUpload(file, opts, surface);
  let freeTiles = 0;
  for (let i = 0; i < plan.blocked.length; i++) if (plan.blocked[i] === 0) freeTiles++;
  return { preview: { ...floorplanToJson(plan), freeTiles } };
}

function planFromBody(body: SaveVersionBody): Floorplan {
  try {
    return floorplanFromJson(body.plan);
  } catch (err) {
    if (err instanceof FloorplanParseError) {
      const field = err.where.field ? `plan.${err.where.field}` : "plan";
      throw new TesseraError("unprocessable", "floorplan", `The floorplan is not valid: ${err.message}.`, { fields: { [field]: [err.reason] }, cause: err });
    }
    throw err;
  }
}

/** POST /api/floorplans/[id]/versions: a new immutable version from the JSON form; idle robots on it move to it. */
export async function saveFloorplanVersion(floorplanId: number, body: SaveVersionBody, user: SessionUser | null) {
  const plan = planFromBody(body);
  requireFreeTile(plan, "floorplan", "The floorplan", "plan.blocked");
  const saved = await saveVersion(appDb(), { floorplanId, plan, note: body.note, userId: userIdOf(user) });
  await tellFleet(floorplanId);
  return { version: (await versionsOf(appDb(), floorplanId)).find((v) => v.id === saved.versionId) };
}

/** The CSV or JSON export of one version (the latest by default). */
export async function exportFloorplan(floorplanId: number, format: "csv" | "json", version?: number): Promise<Response> {
  const db = appDb();
  const { info } = await versionRow(floorplanId, version);
  const row = await versionById(db, info.id);
  const named = (await db.select({ name: floorplans.name }).from(floorplans).where(eq(floorplans.id, floorplanId)).limit(1))[0];
  if (!row || !named) throw new TesseraError("not_found", "floorplan", `There is no floorplan ${floorplanId}.`);
  const plan = planFromVersion(row);
  const slug = named.name.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "") || "floorplan";
  const filename = `tessera-${slug}-v${info.version}.${format}`;
  const text = format === "csv" ? floorplanToCsv(plan) : `${JSON.stringify({ name: named.name, version: info.version, ...floorplanToJson(plan) }, null, 2)}\n`;
  return new Response(text, {
    headers: {
      "content-type": format === "csv" ? "text/csv; charset=utf-8" : "application/json; charset=utf-8",
      "content-disposition": `attachment; filename="${filename}"`,
    },
  });
}

/** The uploaded file an imported version was parsed from, byte for byte. */
export async function floorplanOriginal(floorplanId: number, version: number): Promise<Response> {
  const { info } = await versionRow(floorplanId, version);
  const upload = await uploadOfVersion(appDb(), floorplanId, info.id);
  if (!upload) throw new TesseraError("not_found", "floorplan", `Version ${version} of floorplan ${floorplanId} was not imported from a file.`);
  return new Response(new Uint8Array(upload.bytes), {
    headers: {
      // Served as a download and never sniffed: the bytes are whatever the admin uploaded.
      "content-type": "application/octet-stream",
      "x-content-type-options": "nosniff",
      "content-disposition": `attachment; filename="${upload.filename.replace(/["\\\r\n]/g, "_")}"`,
    },
  });
}

