/** Notes on a mission, with photos: what the page sends and what the API answers. */
import { z } from "zod";

/** Most photos on one note, and the largest photo accepted, in bytes. */
export const NOTE_PHOTO_LIMIT = 4;
export const PHOTO_MAX_BYTES = 8 * 1024 * 1024;

/** The text fields of a new note (the multipart form's `text` and optional `step`). */
export const NoteFieldsSchema = z.object({
  text: z.string().trim().min(1, "write something").max(2000, "2000 characters at most"),
  step: z.coerce.number().int().min(0).optional(),
});
export type NoteFields = z.infer<typeof NoteFieldsSchema>;

export const NotePhotoSchema = z.object({
  id: z.number().int(),
  mime: z.enum(["image/png", "image/jpeg"]),
  width: z.number().int(),
  height: z.number().int(),
});

export const NoteSchema = z.object({
  id: z.number().int(),
  missionId: z.number().int(),
  step: z.number().int().nullable(),
  text: z.string(),
  author: z.string(),
  createdAt: z.number(),
  photos: z.array(NotePhotoSchema),
});
export type Note = z.infer<typeof NoteSchema>;
