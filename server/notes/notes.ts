/** Notes on missions and their photos, stored beside the mission; viewers read them, operators write them. */
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Db } from "../../db/client";
import { audit, missionNotes, missionPhotos, missions, users } from "../../db/schema";
import { NOTE_PHOTO_LIMIT, PHOTO_MAX_BYTES, type Note, type NoteFields } from "../../lib/protocol/notes";
import { TesseraError } from "../errors";
import { checkPhoto, type CheckedPhoto } from "./photos";

/** The whole multipart body a note may take: its photos and some room for the text fields. */
export const NOTE_BODY_MAX_BYTES = NOTE_PHOTO_LIMIT * PHOTO_MAX_BYTES + 64 * 1024;

async function requireMission(db: Db, missionId: number): Promise<void> {
  const row = (await db.select({ id: missions.id }).from(missions).where(eq(missions.id, missionId)).limit(1))[0];
  if (!row) throw new TesseraError("not_found", "notes", `There is no mission ${missionId}.`);
}

/**
 * Stores a note with its photos in one transaction, after every photo has been checked,
 * so a bad photo leaves nothing half-stored.
 */
export async function addNote(db: Db, input: { missionId: number; userId: number; fields: NoteFields; photos: { name: string; bytes: Buffer }[] }): Promise<Note> {
  await requireMission(db, input.missionId);
  if (input.photos.length > NOTE_PHOTO_LIMIT) {
    throw new TesseraError("bad_request", "notes", `A note takes at most ${NOTE_PHOTO_LIMIT} photos; this one has ${input.photos.length}.`);
  }
  const checked: CheckedPhoto[] = [];
  for (const p of input.photos) checked.push(await checkPhoto(p.name, p.bytes));
  const noteId = await db.transaction(async (tx) => {
    const [{ id }] = await tx
      .insert(missionNotes)
      .values({ missionId: input.missionId, userId: input.userId, step: input.fields.step ?? null, text: input.fields.text })
      .$returningId();
    for (const p of checked) await tx.insert(missionPhotos).values({ noteId: id, mime: p.mime, width: p.width, height: p.height, bytes: p.bytes, thumb: p.thumb });
    await tx.insert(audit).values({ userId: input.userId, action: "note", target: `mission ${input.missionId}`, detail: { note: id, photos: checked.length, step: input.fields.step ?? null } });
    return id;
  });
  const note = (await listNotes(db, input.missionId)).find((n) => n.id === noteId);
  if (!note) throw new TesseraError("internal", "notes", `Note ${noteId} was stored but could not be read back.`);
  return note;
}

/** A mission's notes, oldest first, with their photos' descriptions (not their bytes). */
export async function listNotes(db: Db, missionId: number): Promise<Note[]> {
  await requireMission(db, missionId);
  const rows = await db
    .select({ id: missionNotes.id, step: missionNotes.step, text: missionNotes.text, createdAt: missionNotes.createdAt, author: users.name })
    .from(missionNotes)
    .leftJoin(users, eq(users.id, missionNotes.userId))
    .where(eq(missionNotes.missionId, missionId))
    .orderBy(asc(missionNotes.createdAt), asc(missionNotes.id));
  const ids = rows.map((r) => r.id);
  const photos = ids.length
    ? await db
        .select({ id: missionPhotos.id, noteId: missionPhotos.noteId, mime: missionPhotos.mime, width: missionPhotos.width, height: missionPhotos.height })
        .from(missionPhotos)
        .where(inArray(missionPhotos.noteId, ids))
        .orderBy(asc(missionPhotos.id))
    : [];
  return rows.map((r) => ({
    id: r.id,
    missionId,
    step: r.step,
    text: r.text,
    author: r.author ?? "a former user",
    createdAt: r.createdAt.getTime(),
    photos: photos.filter((p) => p.noteId === r.id).map((p) => ({ id: p.id, mime: p.mime as "image/png" | "image/jpeg", width: p.width, height: p.height })),
  }));
}

/** A photo's stored bytes (or its JPEG thumbnail), only when it belongs to a note of `missionId`. */
export async function photoBytes(db: Db, missionId: number, photoId: number, size: "full" | "thumb"): Promise<{ mime: string; bytes: Buffer }> {
  const row = (
    await db
      .select({ mime: missionPhotos.mime, bytes: missionPhotos.bytes, thumb: missionPhotos.thumb })
      .from(missionPhotos)
      .innerJoin(missionNotes, eq(missionNotes.id, missionPhotos.noteId))
      .where(and(eq(missionPhotos.id, photoId), eq(missionNotes.missionId, missionId)))
      .limit(1)
  )[0];
  if (!row) throw new TesseraError("not_found", "notes", `Mission ${missionId} has no photo ${photoId}.`);
  return size === "thumb" ? { mime: "image/jpeg", bytes: row.thumb } : { mime: row.mime, bytes: row.bytes };
}
