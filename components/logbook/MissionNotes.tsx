"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { NOTE_PHOTO_LIMIT, NoteFieldsSchema, PHOTO_MAX_BYTES, type Note } from "@/lib/protocol/notes";

const FormSchema = z.object({ text: NoteFieldsSchema.shape.text, step: z.string().regex(/^\d*$/, "a step number, or empty") });
type FormValues = z.infer<typeof FormSchema>;

function NoteForm({ missionId }: { missionId: number }) {
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [error, setError] = useState<string | null>(null);
  const form = useForm<FormValues>({ resolver: zodResolver(FormSchema), defaultValues: { text: "", step: "" } });
  const onSubmit = form.handleSubmit(async (v) => {
    setError(null);
    const body = new FormData();
    body.set("text", v.text);
    if (v.step !== "") body.set("step", v.step);
    for (const f of files) body.append("photo", f);
    const res = await fetch(`/api/missions/${missionId}/notes`, { method: "POST", body, credentials: "same-origin" });
    if (!res.ok) {
      const answer = await res.json().catch(() => null);
      setError(answer?.error?.message ?? `The server answered ${res.status}.`);
      return;
    }
    form.reset();
    setFiles([]);
    router.refresh();
  });
  const tooBig = files.find((f) => f.size > PHOTO_MAX_BYTES);
  return (
    <form onSubmit={onSubmit} aria-label="Add a note" className="space-y-2 rounded-md border border-ink-700 p-3 text-sm">
      <label className="block text-ink-300">
        Note
        <textarea rows={3} aria-label="Note text" className="mt-1 block w-full rounded border border-ink-700 bg-ink-800 p-2 text-ink-100" {...form.register("text")} />
      </label>
      {form.formState.errors.text && <p className="text-coral">{form.formState.errors.text.message}</p>}
      <div className="flex flex-wrap items-end gap-4">
        <label className="text-ink-300">
          At replay step (optional)
          <input aria-label="Replay step of the note" inputMode="numeric" className="ml-2 w-20 rounded border border-ink-700 bg-ink-800 px-1.5 py-0.5 font-mono" {...form.register("step")} />
        </label>
        <label className="text-ink-300">
          Photos (PNG or JPEG, up to {NOTE_PHOTO_LIMIT}, {PHOTO_MAX_BYTES / 1048576} MB each)
          <input
            type="file"
            multiple
            accept="image/png,image/jpeg"
            aria-label="Photos"
            className="ml-2 text-xs"
            onChange={(e) => setFiles(Array.from(e.target.files ?? []).slice(0, NOTE_PHOTO_LIMIT))}
          />
        </label>
        <button type="submit" disabled={form.formState.isSubmitting || Boolean(tooBig)} className="rounded-md bg-tide px-3 py-1 font-medium text-ink-950 disabled:opacity-50">
          {form.formState.isSubmitting ? "Saving…" : "Add note"}
        </button>
      </div>
      {form.formState.errors.step && <p className="text-coral">{form.formState.errors.step.message}</p>}
      {tooBig && <p className="text-coral">{tooBig.name} is over {PHOTO_MAX_BYTES / 1048576} MB.</p>}
      {error && (
        <p role="alert" className="text-coral">
          {error}
        </p>
      )}
    </form>
  );
}

/** A mission's notes with their photo thumbnails; operators and admins can add one. */
export function MissionNotes({ missionId, notes, canWrite }: { missionId: number; notes: Note[]; canWrite: boolean }) {
  return (
    <section className="space-y-3" aria-label="Notes">
      <h2 className="text-lg font-semibold">Notes</h2>
      {notes.length === 0 && <p className="text-sm text-ink-500">No notes on this mission yet.</p>}
      <ul className="space-y-2">
        {notes.map((n) => (
          <li key={n.id} className="rounded-md border border-ink-800 p-2 text-sm" data-testid="mission-note">
            <div className="flex gap-3 text-xs text-ink-500">
              <span>{n.author}</span>
              <span className="font-mono">{new Date(n.createdAt).toISOString().slice(0, 16).replace("T", " ")} UTC</span>
              {n.step !== null && <span>at step {n.step}</span>}
            </div>
            <p className="whitespace-pre-wrap">{n.text}</p>
            {n.photos.length > 0 && (
              <div className="mt-2 flex flex-wrap gap-2">
                {n.photos.map((p) => (
                  <a key={p.id} href={`/api/missions/${missionId}/photos/${p.id}`} target="_blank" rel="noreferrer" className="block">
                    {/* A plain img: thumbnails come from Tessera's own API with the session cookie. */}
                    <img
                      src={`/api/missions/${missionId}/photos/${p.id}?size=thumb`}
                      alt={`Photo ${p.width} × ${p.height} on the note by ${n.author}`}
                      className="h-24 rounded border border-ink-700 object-cover"
                    />
                  </a>
                ))}
              </div>
            )}
          </li>
        ))}
      </ul>
      {canWrite && <NoteForm missionId={missionId} />}
    </section>
  );
}
