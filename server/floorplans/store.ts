/**
 * Floorplans in the database: imports (floorplan, first version and the kept original in
 * one transaction), new versions numbered one past the last, and the audit rows that say
 * who did it. Versions are only ever inserted, never updated.
 */
import { and, desc, eq, inArray, max } from "drizzle-orm";
import type { Db } from "../../db/client";
import { encodeLayers } from "../../db/queries/floorplans";
import { audit, floorplans, floorplanUploads, floorplanVersions, users } from "../../db/schema";
import type { Floorplan } from "../../lib/floorplan";
import type { FloorplanVersionInfo } from "../../lib/protocol";
import { TesseraError } from "../errors";
import type { UploadedFile } from "./upload";

function isDuplicateKey(err: unknown): boolean {
  for (let e: unknown = err; e; e = (e as { cause?: unknown }).cause) {
    if ((e as { code?: string }).code === "ER_DUP_ENTRY") return true;
  }
  return false;
}

function versionValues(floorplanId: number, version: number, plan: Floorplan, note: string | null, userId: number | null) {
  return { floorplanId, version, rows: plan.rows, cols: plan.cols, tileM: plan.tileM, layers: encodeLayers(plan), note, createdBy: userId };
}

/** Creates a floorplan from an upload: version 1 and the original file beside it; 409 when the name is taken. */
export async function importFloorplan(
  db: Db,
  input: { name: string; plan: Floorplan; note: string | null; file: UploadedFile; userId: number | null; detail: Record<string, unknown> },
): Promise<{ floorplanId: number; versionId: number }> {
  try {
    return await db.transaction(async (tx) => {
      const [{ id: floorplanId }] = await tx.insert(floorplans).values({ name: input.name }).$returningId();
      const [{ id: versionId }] = await tx.insert(floorplanVersions).values(versionValues(floorplanId, 1, input.plan, input.note, input.userId)).$returningId();
      await tx.insert(floorplanUploads).values({
        versionId,
        filename: input.file.filename,
        mime: input.file.mime,
        size: input.file.bytes.byteLength,
        bytes: Buffer.from(input.file.bytes),
        createdBy: input.userId,
      });
      await tx.insert(audit).values({
        userId: input.userId,
        action: "floorplan.imported",
        target: `floorplan:${floorplanId}`,
        detail: { name: input.name, version: 1, versionId, filename: input.file.filename, rows: input.plan.rows, cols: input.plan.cols, ...input.detail },
      });
      return { floorplanId, versionId };
    });
  } catch (err) {
    if (isDuplicateKey(err)) throw new TesseraError("conflict", "floorplans", `A floorplan named "${input.name}" already exists.`, { fields: { name: ["name already used"] }, cause: err });
    throw err;
  }
}

/** Adds the next version of a floorplan; 404 when it does not exist. */
export async function saveVersion(db: Db, input: { floorplanId: number; plan: Floorplan; note: string; userId: number | null }): Promise<{ versionId: number; version: number }> {
  const exists = await db.select({ id: floorplans.id }).from(floorplans).where(eq(floorplans.id, input.floorplanId)).limit(1);
  if (!exists.length) throw new TesseraError("not_found", "floorplan", `There is no floorplan ${input.floorplanId}.`);
  // Two saves at once both read the same last number; the unique (floorplan, version) index refuses the second, which then takes the next.
  for (let attempt = 0; ; attempt++) {
    try {
      return await db.transaction(async (tx) => {
        const [{ last }] = await tx.select({ last: max(floorplanVersions.version) }).from(floorplanVersions).where(eq(floorplanVersions.floorplanId, input.floorplanId));
        const version = Number(last ?? 0) + 1;
        const [{ id: versionId }] = await tx.insert(floorplanVersions).values(versionValues(input.floorplanId, version, input.plan, input.note, input.userId)).$returningId();
        await tx.insert(audit).values({
          userId: input.userId,
          action: "floorplan.saved",
          target: `floorplan:${input.floorplanId}`,
          detail: { version, versionId, note: input.note, rows: input.plan.rows, cols: input.plan.cols },
        });
        return { versionId, version };
      });
    } catch (err) {
      if (!isDuplicateKey(err) || attempt >= 3) throw err;
    }
  }
}

/** Every version of a floorplan, newest first, without the layers. */
export async function versionsOf(db: Db, floorplanId: number): Promise<FloorplanVersionInfo[]> {
  const rows = await db
    .select({
      id: floorplanVersions.id,
      version: floorplanVersions.version,
      rows: floorplanVersions.rows,
      cols: floorplanVersions.cols,
      tileM: floorplanVersions.tileM,
      note: floorplanVersions.note,
      createdBy: users.name,
      createdAt: floorplanVersions.createdAt,
    })
    .from(floorplanVersions)
    .leftJoin(users, eq(users.id, floorplanVersions.createdBy))
    .where(eq(floorplanVersions.floorplanId, floorplanId))
    .orderBy(desc(floorplanVersions.version));
  const ids = rows.map((r) => r.id);
  const uploads = ids.length
    ? await db
        .select({ versionId: floorplanUploads.versionId, filename: floorplanUploads.filename, mime: floorplanUploads.mime, size: floorplanUploads.size })
        .from(floorplanUploads)
        .where(inArray(floorplanUploads.versionId, ids))
    : [];
  const byVersion = new Map(uploads.map((u) => [u.versionId, { filename: u.filename, mime: u.mime, size: u.size }]));
  return rows.map((r) => ({ ...r, createdBy: r.createdBy ?? null, createdAt: r.createdAt.getTime(), upload: byVersion.get(r.id) ?? null }));
}

/** Each floorplan with its latest version's size, newest version first per floorplan. */
export async function latestVersions(db: Db) {
  const plans = await db.select().from(floorplans).orderBy(floorplans.name);
  const versions = await db
    .select({ id: floorplanVersions.id, floorplanId: floorplanVersions.floorplanId, version: floorplanVersions.version, rows: floorplanVersions.rows, cols: floorplanVersions.cols, tileM: floorplanVersions.tileM, createdAt: floorplanVersions.createdAt })
    .from(floorplanVersions)
    .orderBy(desc(floorplanVersions.version));
  const latest = new Map<number, (typeof versions)[number]>();
  for (const v of versions) if (!latest.has(v.floorplanId)) latest.set(v.floorplanId, v);
  return plans.flatMap((p) => {
    const v = latest.get(p.id);
    return v ? [{ floorplan: p, version: v }] : [];
  });
}

/** The kept original of an imported version, or undefined. */
export async function uploadOfVersion(db: Db, floorplanId: number, versionId: number) {
  const rows = await db
    .select({ filename: floorplanUploads.filename, mime: floorplanUploads.mime, bytes: floorplanUploads.bytes })
    .from(floorplanUploads)
    .innerJoin(floorplanVersions, eq(floorplanVersions.id, floorplanUploads.versionId))
    .where(and(eq(floorplanUploads.versionId, versionId), eq(floorplanVersions.floorplanId, floorplanId)))
    .limit(1);
  return rows[0];
}
