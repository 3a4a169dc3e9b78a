/**
 * Photo uploads for mission notes: the type is read from the bytes (never from the file
 * name or the declared type), the dimensions from the header before any pixel is decoded,
 * and a thumbnail is made from the decoded image.
 */
import { imageSize } from "image-size";
import { Jimp } from "jimp";
import { PHOTO_MAX_BYTES } from "../../lib/protocol/notes";
import { TesseraError } from "../errors";

/** Largest side and pixel count decoded; a header may claim anything. */
const MAX_SIDE = 12_000;
const MAX_PIXELS = 40_000_000;
/** Thumbnails fit in this square. */
const THUMB_SIDE = 240;

export interface CheckedPhoto {
  mime: "image/png" | "image/jpeg";
  width: number;
  height: number;
  bytes: Buffer;
  thumb: Buffer;
}

/** Checks one uploaded photo and makes its thumbnail; throws a TesseraError saying what is wrong with `name`. */
export async function checkPhoto(name: string, bytes: Buffer): Promise<CheckedPhoto> {
  if (bytes.length === 0) throw new TesseraError("bad_request", "notes", `Photo "${name}" is empty.`);
  if (bytes.length > PHOTO_MAX_BYTES) {
    throw new TesseraError("too_large", "notes", `Photo "${name}" is ${(bytes.length / 1048576).toFixed(1)} MB; the limit is ${PHOTO_MAX_BYTES / 1048576} MB.`);
  }
  let header: { type?: string; width?: number; height?: number };
  try {
    header = imageSize(bytes);
  } catch {
    throw new TesseraError("unsupported", "notes", `Photo "${name}" is not a PNG or JPEG image.`);
  }
  const mime = header.type === "png" ? "image/png" : header.type === "jpg" ? "image/jpeg" : null;
  if (!mime) throw new TesseraError("unsupported", "notes", `Photo "${name}" is a ${header.type ?? "unknown"} file; only PNG and JPEG photos are taken.`);
  const width = header.width ?? 0;
  const height = header.height ?? 0;
  if (width < 1 || height < 1 || width > MAX_SIDE || height > MAX_SIDE || width * height > MAX_PIXELS) {
    throw new TesseraError("unprocessable", "notes", `Photo "${name}" claims ${width} × ${height} pixels; at most ${MAX_SIDE} a side and ${MAX_PIXELS / 1e6} megapixels are taken.`);
  }
  let image: Awaited<ReturnType<typeof Jimp.read>>;
  try {
    image = await Jimp.read(bytes);
  } catch (cause) {
    throw new TesseraError("unprocessable", "notes", `Photo "${name}" could not be decoded; the file may be damaged.`, { cause });
  }
  if (width > THUMB_SIDE || height > THUMB_SIDE) image.scaleToFit({ w: THUMB_SIDE, h: THUMB_SIDE });
  const thumb = await image.getBuffer("image/jpeg", { quality: 80 });
  return { mime, width, height, bytes, thumb };
}
