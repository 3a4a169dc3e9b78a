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
