import { NoteFieldsSchema } from "@/lib/protocol/notes";
import { addNote, appDbForRoutes, formFiles, listNotes, missionIdParam, NOTE_BODY_MAX_BYTES, readMultipart, route, TesseraError, zodFields } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "notes" }, async ({ params }) => {
  return { items: await listNotes(appDbForRoutes(), missionIdParam(params.id, "notes")) };
});

/** A note with up to four photos, as multipart fields `text`, `step` (optional) and `photo` (repeated). */
export const POST = route({ role: "operator", surface: "notes" }, async ({ req, params, user }) => {
  const missionId = missionIdParam(params.id, "notes");
  const form = await readMultipart(req, { maxBytes: NOTE_BODY_MAX_BYTES, surface: "notes" });
  const step = form.get("step");
  const fields = NoteFieldsSchema.safeParse({ text: form.get("text") ?? "", step: typeof step === "string" && step !== "" ? step : undefined });
  if (!fields.success) throw new TesseraError("bad_request", "notes", "The note is not valid.", { fields: zodFields(fields.error) });
  const note = await addNote(appDbForRoutes(), { missionId, userId: Number(user!.id), fields: fields.data, photos: await formFiles(form, "photo") });
  return Response.json({ note }, { status: 201 });
});
