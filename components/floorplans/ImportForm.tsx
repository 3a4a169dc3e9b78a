"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useEffect, useMemo, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { floorplanFromJson } from "@/lib/floorplan/json";
import type { Floorplan } from "@/lib/floorplan/types";
import { FLOORPLAN_UPLOAD_MAX_BYTES, ImportFieldsSchema } from "@/lib/protocol/floorplans";
import { TileCanvas } from "./TileCanvas";

type FormIn = z.input<typeof ImportFieldsSchema>;
type FormOut = z.output<typeof ImportFieldsSchema>;

interface ErrorBody {
  error?: { message: string; fields?: Record<string, string[]> };
}

type Preview = { state: "none" } | { state: "loading" } | { state: "ready"; plan: Floorplan; freeTiles: number } | { state: "error"; message: string };

const PREVIEW_DELAY_MS = 250;
const isImage = (file: File | null) => file !== null && /\.(png|pgm)$/i.test(file.name);

function formOf(file: File, values: Record<string, unknown>): FormData {
  const form = new FormData();
  form.set("file", file);
  for (const [key, value] of Object.entries(values)) if (value !== undefined && value !== "") form.set(key, String(value));
  return form;
}

/**
 * Import a floorplan from a PNG/PGM image or a CSV/text grid. The preview is parsed by the
 * server exactly as the import will be (the same lib/floorplan reader, the same limits),
 * so what the admin sees is what gets stored; the import parses the file again.
 */
export function ImportForm() {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [preview, setPreview] = useState<Preview>({ state: "none" });
  const [submitError, setSubmitError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(ImportFieldsSchema),
    defaultValues: { name: "", tileM: 0.3048, pixelsPerTile: 1, threshold: 128, note: "" },
  });
  const [tileM, pixelsPerTile, threshold] = useWatch({ control, name: ["tileM", "pixelsPerTile", "threshold"] });
  const image = isImage(file);

  useEffect(() => {
    if (!file || fileError) return;
    const controller = new AbortController();
    const timer = setTimeout(async () => {
      setPreview({ state: "loading" });
      try {
        const res = await fetch("/api/floorplans/preview", { method: "POST", body: formOf(file, { tileM, pixelsPerTile, threshold }), signal: controller.signal });
        const body = (await res.json()) as ErrorBody & { preview?: Record<string, unknown> & { freeTiles: number } };
        if (!res.ok || !body.preview) {
          setPreview({ state: "error", message: body.error?.message ?? `The preview failed (HTTP ${res.status}).` });
          return;
        }
        setPreview({ state: "ready", plan: floorplanFromJson(body.preview), freeTiles: body.preview.freeTiles });
      } catch (err) {
        if (!controller.signal.aborted) setPreview({ state: "error", message: `The preview failed: ${(err as Error).message}` });
      }
    }, PREVIEW_DELAY_MS);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [file, fileError, tileM, pixelsPerTile, threshold]);

  const onSubmit = async (values: FormOut) => {
    setSubmitError(null);
    if (!file) {
      setFileError("Choose a PNG, PGM or CSV/text file.");
      return;
    }
    const res = await fetch("/api/floorplans", { method: "POST", body: formOf(file, image ? values : { ...values, pixelsPerTile: undefined, threshold: undefined }) });
    const body = (await res.json()) as ErrorBody & { floorplan?: { id: number } };
    if (!res.ok || !body.floorplan) {
      const fields = body.error?.fields ?? {};
      for (const key of ["name", "tileM", "pixelsPerTile", "threshold"] as const) if (fields[key]) setError(key, { message: fields[key].join("; ") });
      setSubmitError(body.error?.message ?? `The import failed (HTTP ${res.status}).`);
      return;
    }
    router.push(`/floorplans/${body.floorplan.id}`);
    router.refresh();
  };

  const summary = useMemo(() => {
    if (preview.state !== "ready") return null;
    const { rows, cols, tileM: side } = preview.plan;
    return `${rows} × ${cols} tiles (${(rows * side).toFixed(2)} × ${(cols * side).toFixed(2)} m), ${preview.freeTiles} free`;
  }, [preview]);

  const field = "flex flex-col gap-1";
  const input = "rounded border border-ink-700 bg-ink-800 px-2 py-1";
  return (
    <form onSubmit={handleSubmit(onSubmit)} className="grid gap-6 lg:grid-cols-[20rem_1fr]" aria-label="Import a floorplan" noValidate>
      <div className="space-y-4 text-sm">
        <label className={field}>
          <span className="text-ink-500">File (PNG, PGM, CSV or text grid, up to {FLOORPLAN_UPLOAD_MAX_BYTES / (1024 * 1024)} MB)</span>
          <input
            type="file"
            accept=".png,.pgm,.csv,.txt,.json,image/png,text/csv,text/plain"
            onChange={(e) => {
              const chosen = e.target.files?.[0] ?? null;
              setFile(chosen);
              setPreview({ state: "none" });
              setFileError(chosen && chosen.size > FLOORPLAN_UPLOAD_MAX_BYTES ? `${chosen.name} is larger than the ${FLOORPLAN_UPLOAD_MAX_BYTES / (1024 * 1024)} MB limit.` : null);
            }}
            className="text-ink-300 file:mr-3 file:rounded file:border file:border-ink-700 file:bg-ink-800 file:px-2 file:py-1 file:text-ink-100"
          />
          {fileError && <span className="text-coral">{fileError}</span>}
        </label>
        <label className={field}>
          <span className="text-ink-500">Name</span>
          <input {...register("name")} className={input} aria-invalid={errors.name ? true : undefined} />
          {errors.name && <span className="text-coral">{errors.name.message}</span>}
        </label>
        <label className={field}>
          <span className="text-ink-500">Tile size (metres per tile side)</span>
          <input {...register("tileM")} inputMode="decimal" className={`${input} font-mono`} aria-invalid={errors.tileM ? true : undefined} />
          {errors.tileM && <span className="text-coral">{errors.tileM.message}</span>}
        </label>
        <fieldset disabled={!image} className="space-y-4 disabled:opacity-50">
          <legend className="mb-2 text-xs uppercase tracking-wide text-ink-500">Image settings</legend>
          <label className={field}>
            <span className="text-ink-500">Pixels per tile</span>
            <input {...register("pixelsPerTile")} inputMode="numeric" className={`${input} font-mono`} aria-invalid={errors.pixelsPerTile ? true : undefined} />
            {errors.pixelsPerTile && <span className="text-coral">{errors.pixelsPerTile.message}</span>}
          </label>
          <label className={field}>
            <span className="flex justify-between text-ink-500">
              Threshold <span className="font-mono text-ink-300">{String(threshold)}</span>
            </span>
            <input type="range" min={0} max={255} step={1} {...register("threshold")} className="accent-[rgb(var(--tide))]" />
            <span className="text-xs text-ink-500">Tiles whose mean grey is below the threshold are blocked.</span>
          </label>
        </fieldset>
        <label className={field}>
          <span className="text-ink-500">Note (optional)</span>
          <input {...register("note")} className={input} placeholder="Where the drawing came from" />
        </label>
        <button type="submit" disabled={isSubmitting || preview.state !== "ready"} className="rounded-md border border-tide/60 bg-tide/10 px-3 py-1.5 text-tide disabled:opacity-40">
          {isSubmitting ? "Importing…" : "Import floorplan"}
        </button>
        {submitError && (
          <p role="alert" className="text-coral">
            {submitError}
          </p>
        )}
      </div>
      <div className="space-y-2" aria-live="polite">
        <h2 className="text-sm font-medium text-ink-300">Preview</h2>
        {preview.state === "none" && <p className="rounded border border-dashed border-ink-700 p-6 text-sm text-ink-500">Choose a file to see the grid it gives.</p>}
        {preview.state === "loading" && <p className="text-sm text-ink-500">Reading the file…</p>}
        {preview.state === "error" && (
          <p role="alert" className="rounded border border-coral/50 bg-coral/10 p-3 text-sm text-coral" data-testid="preview-error">
            {preview.message}
          </p>
        )}
        {preview.state === "ready" && (
          <>
            <p className="font-mono text-sm text-ink-300" data-testid="preview-summary">
              {summary}
            </p>
            <TileCanvas plan={preview.plan} heightPx={420} label={`Preview of the imported grid, ${summary}`} />
          </>
        )}
      </div>
    </form>
  );
}
