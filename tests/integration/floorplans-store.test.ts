/**
 * Floorplan imports and versions in the real MariaDB: one transaction per import (the
 * floorplan, version 1, the kept original, the audit row), versions numbered one past the
 * last even when two saves race, and a refused import that leaves nothing behind.
 */
import { eq, inArray, like } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { audit, floorplans, floorplanUploads, floorplanVersions } from "../../db/schema";
import { isTesseraError } from "../../server/errors";
import { importFloorplan, saveVersion, versionsOf } from "../../server/floorplans/store";
import { planFromLines } from "../support/plans";

let db: Db;
const tag = `${process.pid}-${Date.now() % 100000}`;
const file = (text: string) => ({ filename: "room.csv", mime: "text/csv", bytes: new TextEncoder().encode(text) });

beforeAll(() => {
  db = openDb(inject("databaseUrl"));
});

afterAll(async () => {
  await closeDb();
});

describe("floorplan store", () => {
  it("stores an import with its original and audit row, and numbers racing saves 2, 3, 4", async () => {
    const plan = planFromLines(["###", "#.#", "###"]);
    const { floorplanId, versionId } = await importFloorplan(db, { name: `Store ${tag}`, plan, note: null, file: file("1,1,1\n1,0,1\n1,1,1\n"), userId: null, detail: { kind: "text" } });
    const kept = await db.select().from(floorplanUploads).where(eq(floorplanUploads.versionId, versionId));
    expect(kept.map((k) => [k.filename, k.size, k.bytes.toString("utf8")])).toEqual([["room.csv", 18, "1,1,1\n1,0,1\n1,1,1\n"]]);
    expect((await db.select().from(audit).where(eq(audit.target, `floorplan:${floorplanId}`))).map((a) => a.action)).toEqual(["floorplan.imported"]);

    const wider = planFromLines(["####", "#..#", "####"]);
    const saved = await Promise.all([1, 2, 3].map((k) => saveVersion(db, { floorplanId, plan: wider, note: `race ${k}`, userId: null })));
    expect(saved.map((s) => s.version).sort()).toEqual([2, 3, 4]);
    const versions = await versionsOf(db, floorplanId);
    expect(versions.map((v) => v.version)).toEqual([4, 3, 2, 1]);
    expect(versions.at(-1)).toMatchObject({ id: versionId, cols: 3, upload: { filename: "room.csv", size: 18 } });
    expect((await db.select().from(audit).where(eq(audit.target, `floorplan:${floorplanId}`))).filter((a) => a.action === "floorplan.saved")).toHaveLength(3);
  });

  it("refuses a taken name with 409 and leaves no version, upload or audit row behind", async () => {
    const plan = planFromLines(["..", ".#"]);
    const name = `Taken ${tag}`;
    await importFloorplan(db, { name, plan, note: null, file: file("0,0\n0,1\n"), userId: null, detail: {} });
    let refused: unknown;
    try {
      await importFloorplan(db, { name, plan, note: null, file: file("0,0\n0,1\n"), userId: null, detail: {} });
    } catch (err) {
      refused = err;
    }
    expect(isTesseraError(refused) && [refused.status, refused.message]).toEqual([409, `A floorplan named "${name}" already exists.`]);
    const ids = (await db.select({ id: floorplans.id }).from(floorplans).where(like(floorplans.name, `Taken ${tag}%`))).map((r) => r.id);
    expect(ids).toHaveLength(1);
    const versions = await db.select({ id: floorplanVersions.id }).from(floorplanVersions).where(inArray(floorplanVersions.floorplanId, ids));
    expect(versions).toHaveLength(1);
    const uploads = await db.select({ id: floorplanUploads.id }).from(floorplanUploads).where(inArray(floorplanUploads.versionId, versions.map((v) => v.id)));
    expect(uploads).toHaveLength(1);
  });

  it("answers 404 for a version of a floorplan that does not exist", async () => {
    let refused: unknown;
    try {
      await saveVersion(db, { floorplanId: 987654321, plan: planFromLines([".."]), note: "nowhere", userId: null });
    } catch (err) {
      refused = err;
    }
    expect(isTesseraError(refused) && refused.status).toBe(404);
  });
});
