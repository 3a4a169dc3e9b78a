/** What app/ uses of the server for the logbook's curves, what-if replay and notes; re-exported by server/facade.ts. */
export { certaintyCurve, robotModels } from "../fleet/certainty-curve";
export { addNote, listNotes, photoBytes, NOTE_BODY_MAX_BYTES } from "../notes/notes";
export { readMultipart, formFiles } from "../http/multipart";
export { zodFields } from "../errors";
