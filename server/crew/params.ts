import { TesseraError } from "../errors";

/** A user id from a route segment; a clear 400 for anything but a positive integer. */
export function userIdParam(raw: string | undefined, surface: string): number {
  const id = Number(raw);
  if (!raw || !Number.isSafeInteger(id) || id <= 0) throw new TesseraError("bad_request", surface, `User id "${raw}" is not a positive integer.`);
  return id;
}
