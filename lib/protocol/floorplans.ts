/**
 * Wire shapes of the floorplan routes, shared by the server and the editor: a summary row
 * of the list, a version's metadata, and the body that saves a new version. The grid in
 * that body is the JSON form of lib/floorplan/json.ts; its strict reader checks every tile
 * and says where it fails, so the schema here only fixes the envelope.
 */
import { z } from "zod";

export const FloorplanSummarySchema = z.object({
  id: z.number().int(),
  name: z.string(),
  isDefault: z.boolean(),
  version: z.number().int(),
  versionId: z.number().int(),
  rows: z.number().int(),
  cols: z.number().int(),
  tileM: z.number(),
  updatedAt: z.number(),
  robots: z.array(z.object({ id: z.string(), name: z.string(), versionId: z.number().int().nullable() })),
});
export type FloorplanSummary = z.infer<typeof FloorplanSummarySchema>;

export const FloorplanVersionInfoSchema = z.object({
  id: z.number().int(),
  version: z.number().int(),
  rows: z.number().int(),
  cols: z.number().int(),
  tileM: z.number(),
  note: z.string().nullable(),
  createdBy: z.string().nullable(),
  createdAt: z.number(),
  /** The uploaded file this version was parsed from, when it was imported. */
  upload: z.object({ filename: z.string(), mime: z.string(), size: z.number().int() }).nullable(),
});
export type FloorplanVersionInfo = z.infer<typeof FloorplanVersionInfoSchema>;

/** POST /api/floorplans/[id]/versions: the whole grid of the new version and why it changed. */
export const SaveVersionBodySchema = z.object({
  note: z.string().trim().min(1, "say what changed").max(500),
  plan: z.record(z.string(), z.unknown()),
});
export type SaveVersionBody = z.infer<typeof SaveVersionBodySchema>;

/** Largest floorplan file accepted by the import, in bytes. */
export const FLOORPLAN_UPLOAD_MAX_BYTES = 2 * 1024 * 1024;

/** Import settings sent as form fields beside the file (strings on the wire, hence the coercion). */
export const ImportOptionsSchema = z.object({
  tileM: z.coerce.number("must be a number of metres").positive("must be a positive number of metres").max(10, "must be at most 10 m"),
  pixelsPerTile: z.coerce.number("must be a number of pixels").int("must be a whole number of pixels").min(1, "must be at least 1").max(256, "must be at most 256").default(1),
  threshold: z.coerce.number().int().min(0).max(255).default(128),
});
export type ImportOptions = z.infer<typeof ImportOptionsSchema>;

export const ImportFieldsSchema = ImportOptionsSchema.extend({
  name: z.string().trim().min(1, "a floorplan needs a name").max(120, "at most 120 characters"),
  note: z.string().trim().max(500).optional(),
});
export type ImportFields = z.infer<typeof ImportFieldsSchema>;
