import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { FloorplanEditor } from "@/components/floorplans/FloorplanEditor";
import { PlanView } from "@/components/floorplans/PlanView";
import { findFloorplanDetail, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Floorplan" };

function when(ms: number): string {
  return new Date(ms).toISOString().replace("T", " ").slice(0, 16);
}

export default async function FloorplanPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { id: rawId } = await params;
  const user = await requirePageRole("viewer", `/floorplans/${rawId}`);
  const rawVersion = (await searchParams).version;
  const wanted = typeof rawVersion === "string" && /^[1-9][0-9]*$/.test(rawVersion) ? Number(rawVersion) : undefined;
  const detail = await findFloorplanDetail(rawId, wanted);
  if (!detail) notFound();
  const { floorplan, versions, robots } = detail;
  const latest = versions[0];
  const admin = user.role === "admin";
  const exportHref = (format: string) => `/api/floorplans/${floorplan.id}/export?format=${format}&version=${floorplan.version}`;
  return (
    <section className="mx-auto max-w-7xl space-y-5 p-6">
      <nav className="text-sm text-ink-500">
        <Link href="/floorplans" className="underline underline-offset-2">
          Floorplans
        </Link>{" "}
        / {floorplan.name}
      </nav>
      <header className="flex flex-wrap items-baseline justify-between gap-3">
        <h1 className="text-xl font-semibold">
          {floorplan.name} <span className="font-mono text-base text-ink-500">v{floorplan.version}</span>
        </h1>
        <div className="flex gap-2 text-sm">
          <a href={exportHref("csv")} className="rounded-md border border-ink-700 px-2.5 py-1 text-ink-300" download>
            Export CSV
          </a>
          <a href={exportHref("json")} className="rounded-md border border-ink-700 px-2.5 py-1 text-ink-300" download>
            Export JSON
          </a>
        </div>
      </header>
      <dl className="flex flex-wrap gap-x-8 gap-y-1 text-sm">
        <div>
          <dt className="text-ink-500">Size</dt>
          <dd className="font-mono">
            {floorplan.rows} × {floorplan.cols} tiles
          </dd>
        </div>
        <div>
          <dt className="text-ink-500">Tile size</dt>
          <dd className="font-mono">{floorplan.tileM} m</dd>
        </div>
        <div>
          <dt className="text-ink-500">Robots</dt>
          <dd>
            {robots.length === 0
              ? "none"
              : robots.map((r) => `${r.name}${r.versionId !== null && r.versionId !== latest.id ? ` (on v${versions.find((v) => v.id === r.versionId)?.version ?? "?"})` : ""}`).join(", ")}
          </dd>
        </div>
      </dl>
      {floorplan.version !== latest.version && (
        <p className="rounded border border-amberline/50 bg-amberline/10 p-2 text-sm text-amberline">
          You are looking at version {floorplan.version}; the latest is version {latest.version}.{admin ? " Saving from here makes a new version from this one." : ""}
        </p>
      )}
      <div className="grid gap-6 xl:grid-cols-[1fr_18rem]">
        <div id="editor">
          {admin ? (
            <FloorplanEditor key={floorplan.versionId} floorplanId={floorplan.id} initial={floorplan} latestVersion={latest.version} />
          ) : (
            <PlanView plan={floorplan} />
          )}
        </div>
        <aside aria-label="Versions" className="space-y-2">
          <h2 className="text-sm font-medium text-ink-300">Versions</h2>
          <ol className="space-y-1.5 text-sm" data-testid="version-list">
            {versions.map((v) => (
              <li key={v.id} className={v.version === floorplan.version ? "rounded border border-tide/40 bg-tide/5 p-2" : "rounded border border-ink-800 p-2"}>
                <div className="flex items-baseline justify-between gap-2">
                  <Link href={`/floorplans/${floorplan.id}?version=${v.version}`} className="font-mono text-tide underline underline-offset-2">
                    Version {v.version}
                  </Link>
                  <span className="font-mono text-xs text-ink-500">
                    {v.rows} × {v.cols}
                  </span>
                </div>
                <p className="text-ink-300">{v.note ?? "—"}</p>
                <p className="text-xs text-ink-500">
                  {when(v.createdAt)} UTC{v.createdBy ? ` · ${v.createdBy}` : ""}
                  {v.upload && admin && (
                    <>
                      {" · "}
                      <a href={`/api/floorplans/${floorplan.id}/original?version=${v.version}`} className="underline underline-offset-2">
                        original {v.upload.filename}
                      </a>
                    </>
                  )}
                </p>
              </li>
            ))}
          </ol>
        </aside>
      </div>
    </section>
  );
}
