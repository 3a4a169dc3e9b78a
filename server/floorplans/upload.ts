/**
 * Floorplan uploads: the multipart body read with a hard byte cap, the file's kind told
 * from its bytes (never from its name or declared type alone), and the grid parsed by
 * lib/floorplan with every failure turned into the error shape and its status.
 */
import { z } from "zod";
import { FloorplanParseError, freeTileCount, parseFloorplan, type Floorplan } from "../../lib/floorplan";
import { FLOORPLAN_UPLOAD_MAX_BYTES, type ImportOptions } from "../../lib/protocol";
import { TesseraError, zodFields } from "../errors";
import { readMultipart } from "../http/multipart";

/** Room for the multipart boundaries and the small text fields around the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

export interface UploadedFile {
  filename: string;
  mime: string;
  bytes: Uint8Array;
}

export type UploadKind = "png" | "pgm" | "text";

/** Reads a multipart form of at most FLOORPLAN_UPLOAD_MAX_BYTES of file: the `file` part and the text fields. */
export async function readUploadForm(req: Request, surface: string): Promise<{ file: UploadedFile; fields: Record<string, string> }> {
  const form = await readMultipart(req, {
    maxBytes: FLOORPLAN_UPLOAD_MAX_BYTES + FORM_OVERHEAD_BYTES,
    surface,
    tooLarge: () => new TesseraError("too_large", surface, `The upload is larger than the ${FLOORPLAN_UPLOAD_MAX_BYTES / (1024 * 1024)} MB limit.`, { fields: { file: ["file too large"] } }),
    notMultipart: "Send the floorplan as multipart/form-data with a `file` part.",
  });
  const part = form.get("file");
  if (!(part instanceof Blob)) throw new TesseraError("bad_request", surface, "Choose a file to import.", { fields: { file: ["missing file"] } });
  if (part.size > FLOORPLAN_UPLOAD_MAX_BYTES) throw new TesseraError("too_large", surface, `The file is larger than the ${FLOORPLAN_UPLOAD_MAX_BYTES / (1024 * 1024)} MB limit.`, { fields: { file: ["file too large"] } });
  if (part.size === 0) throw new TesseraError("unprocessable", surface, "The file is empty.", { fields: { file: ["empty file"] } });
  const fields: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === "string") fields[key] = value;
  const filename = "name" in part && typeof part.name === "string" && part.name !== "" ? part.name : "upload";
  return { file: { filename: filename.slice(0, 255), mime: (part.type || "application/octet-stream").slice(0, 100), bytes: new Uint8Array(await part.arrayBuffer()) }, fields };
}

/** Parses the text fields with `schema`, answering 400 with the fields that fail. */
export function parseFields<S extends z.ZodType>(schema: S, fields: Record<string, string>, surface: string): z.infer<S> {
  const present = Object.fromEntries(Object.entries(fields).filter(([, v]) => v.trim() !== ""));
  const parsed = schema.safeParse(present);
  if (!parsed.success) throw new TesseraError("bad_request", surface, "Some import settings are not valid.", { fields: zodFields(parsed.error) });
  return parsed.data;
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** What the bytes are, from their first bytes; declared image types that do not match are refused. */
export function uploadKind(file: UploadedFile, surface: string): UploadKind {
  const b = file.bytes;
  if (b.length >= 8 && PNG_SIGNATURE.every((v, i) => b[i] === v)) return "png";
  // "P5"/"P2" then whitespace: no text grid starts that way (its first cell would be "P5").
  if (b.length >= 3 && b[0] === 0x50 && (b[1] === 0x35 || b[1] === 0x32) && /\s/.test(String.fromCharCode(b[2]))) return "pgm";
  const claimsImage = file.mime.startsWith("image/") || /\.(png|pgm|jpe?g|gif|bmp|webp|tiff?)$/i.test(file.filename);
  if (claimsImage) {
    throw new TesseraError("unsupported", surface, `${file.filename} is not a PNG or PGM image; import a PNG, a PGM or a CSV/text grid.`, { fields: { file: ["not an image"] } });
  }
  try {
    new TextDecoder("utf-8", { fatal: true }).decode(b);
  } catch {
    throw new TesseraError("unsupported", surface, `${file.filename} is neither a PNG or PGM image nor a UTF-8 CSV/text grid.`, { fields: { file: ["unknown file type"] } });
  }
  return "text";
}

/** The grid in `file`, parsed by lib/floorplan; 415 for an unknown kind, 422 saying where it fails or when no tile is free. */
export function parseUpload(file: UploadedFile, opts: ImportOptions, surface: string): { plan: Floorplan; kind: UploadKind } {
  const kind = uploadKind(file, surface);
  const input = kind === "text" ? new TextDecoder("utf-8").decode(file.bytes) : file.bytes;
  let plan: Floorplan;
  try {
    plan = parseFloorplan(input, { tileM: opts.tileM, ...(kind === "text" ? {} : { pixelsPerTile: opts.pixelsPerTile, threshold: opts.threshold }) });
  } catch (err) {
    if (err instanceof FloorplanParseError) {
      throw new TesseraError("unprocessable", surface, `${file.filename}: ${err.message}.`, { fields: { file: [err.message] }, cause: err });
    }
    throw err;
  }
  requireFreeTile(plan, surface, file.filename, "file");
  return { plan, kind };
}

/** A plan where no robot could stand is refused (422). */
export function requireFreeTile(plan: Floorplan, surface: string, what: string, field: string): void {
  if (freeTileCount(plan) === 0) {
    throw new TesseraError("unprocessable", surface, `${what}: no free tile — all ${plan.rows} × ${plan.cols} tiles are blocked.`, { fields: { [field]: ["no free tile"] } });
  }
}
