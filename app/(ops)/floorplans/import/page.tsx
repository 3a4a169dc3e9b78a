import type { Metadata } from "next";
import Link from "next/link";
import { ImportForm } from "@/components/floorplans/ImportForm";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Import floorplan" };

export default async function ImportFloorplanPage() {
  await requirePageRole("admin", "/floorplans/import");
  return (
    <section className="mx-auto max-w-6xl space-y-4 p-6">
      <nav className="text-sm text-ink-500">
        <Link href="/floorplans" className="underline underline-offset-2">
          Floorplans
        </Link>{" "}
        / Import
      </nav>
      <h1 className="text-xl font-semibold">Import a floorplan</h1>
      <p className="max-w-3xl text-sm text-ink-300">
        An image (PNG or PGM) is cut into square tiles of the given number of pixels; a tile whose mean grey is under the threshold is blocked. A CSV or text grid gives one
        row per line, 0 for free and 1 for blocked, with an optional annotation grid after a line of <code className="font-mono">---</code> (mark classes, D for docks, X for
        no-go). Plans up to 512 × 512 tiles; images up to 4096 × 4096 pixels.
      </p>
      <ImportForm />
    </section>
  );
}
