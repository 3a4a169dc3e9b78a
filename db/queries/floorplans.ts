/** Floorplans and their immutable versions, stored as four byte layers. */
import { and, desc, eq } from "drizzle-orm";
import type { Floorplan } from "../../lib/floorplan";
import type { Db } from "../client";
import { floorplans, floorplanVersions, type FloorplanVersionRow } from "../schema";

export function encodeLayers(plan: Floorplan): Buffer {
  const n = plan.rows * plan.cols;
  const out = Buffer.alloc(n * 4);
  out.set(plan.blocked, 0);
  out.set(plan.mark, n);
  out.set(plan.dock, 2 * n);
  out.set(plan.nogo, 3 * n);
  return out;
}

export function planFromVersion(row: Pick<FloorplanVersionRow, "rows" | "cols" | "tileM" | "layers">): Floorplan {
  const n = row.rows * row.cols;
  const bytes = new Uint8Array(row.layers.buffer, row.layers.byteOffset, row.layers.byteLength);
  if (bytes.length !== n * 4) throw new Error(`floorplan layers hold ${bytes.length} bytes, expected ${n * 4}`);
  return {
    rows: row.rows,
    cols: row.cols,
    tileM: row.tileM,
    blocked: bytes.slice(0, n),
    mark: bytes.slice(n, 2 * n),
    dock: bytes.slice(2 * n, 3 * n),
    nogo: bytes.slice(3 * n, 4 * n),
  };
}

export async function defaultFloorplanId(db: Db): Promise<number | undefined> {
  const rows = await db.select({ id: floorplans.id }).from(floorplans).orderBy(desc(floorplans.isDefault), floorplans.id).limit(1);
  return rows[0]?.id;
}

export async function latestVersion(db: Db, floorplanId: number): Promise<FloorplanVersionRow | undefined> {
  const rows = await db
    .select()
    .from(floorplanVersions)
    .where(eq(floorplanVersions.floorplanId, floorplanId))
    .orderBy(desc(floorplanVersions.version))
    .limit(1);
  return rows[0];
}

export async function versionById(db: Db, versionId: number): Promise<FloorplanVersionRow | undefined> {
  const rows = await db.select().from(floorplanVersions).where(eq(floorplanVersions.id, versionId)).limit(1);
  return rows[0];
}

/** Creates a floorplan with its first version; returns both ids. */
export async function createFloorplan(
  db: Db,
  input: { name: string; plan: Floorplan; isDefault?: boolean; note?: string; createdBy?: number },
): Promise<{ floorplanId: number; versionId: number }> {
  return db.transaction(async (tx) => {
    const [{ id: floorplanId }] = await tx.insert(floorplans).values({ name: input.name, isDefault: input.isDefault ? 1 : 0 }).$returningId();
    const [{ id: versionId }] = await tx
      .insert(floorplanVersions)
      .values({
        floorplanId,
        version: 1,
        rows: input.plan.rows,
        cols: input.plan.cols,
        tileM: input.plan.tileM,
        layers: encodeLayers(input.plan),
        note: input.note ?? null,
        createdBy: input.createdBy ?? null,
      })
      .$returningId();
    return { floorplanId, versionId };
  });
}

export async function floorplanByName(db: Db, name: string) {
  const rows = await db.select().from(floorplans).where(and(eq(floorplans.name, name))).limit(1);
  return rows[0];
}

export async function listFloorplans(db: Db) {
  return db.select({ id: floorplans.id, name: floorplans.name }).from(floorplans).orderBy(floorplans.id);
}
