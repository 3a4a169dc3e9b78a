import { TesseraError } from "../errors";

/** A mission id from a route segment; a clear 400 for anything but a positive integer. */
export function missionIdParam(raw: string | undefined, surface: string): number {
  const id = Number(raw);
  if (!raw || !Number.isInteger(id) || id <= 0) throw new TesseraError("bad_request", surface, `Mission id "${raw}" is not a positive integer.`);
  return id;
}
