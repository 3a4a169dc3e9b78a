import type { Metadata } from "next";
import Link from "next/link";
import { floorplanSummaries, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Floorplans" };

function when(ms: number): string {
  return new Date(ms).toISOString().replace("T", " ").slice(0, 16);
}

export default async function FloorplansPage() {
  const user = await requirePageRole("viewer", "/floorplans");
  const admin = user.role === "admin";
  const plans = await floorplanSummaries();
  return (
    <section className="mx-auto max-w-6xl space-y-4 p-6">
      <div className="flex items-center justify-between">
        <h1 className="text-xl font-semibold">Floorplans</h1>
        {admin && (
          <Link href="/floorplans/import" className="rounded-md border border-tide/60 bg-tide/10 px-3 py-1 text-sm text-tide">
            Import floorplan
          </Link>
        )}
      </div>
      <table className="w-full text-sm" aria-label="Floorplans">
        <thead className="text-left text-ink-500">
          <tr>
            <th className="py-1">Name</th>
            <th>Size (tiles)</th>
            <th>Tile size</th>
            <th>Version</th>
            <th>Last saved (UTC)</th>
            <th>Robots</th>
            {admin && <th className="sr-only">Actions</th>}
          </tr>
        </thead>
        <tbody>
          {plans.map((p) => (
            <tr key={p.id} className="border-t border-ink-800">
              <td className="py-1.5">
                <Link href={`/floorplans/${p.id}`} className="text-tide underline underline-offset-2">
                  {p.name}
                </Link>
                {p.isDefault && <span className="ml-2 rounded bg-ink-800 px-1.5 py-px text-xs text-ink-300">default</span>}
              </td>
              <td className="font-mono">
                {p.rows} × {p.cols}
              </td>
              <td className="font-mono">{p.tileM.toFixed(4).replace(/0+$/, "").replace(/\.$/, "")} m</td>
              <td className="font-mono">v{p.version}</td>
              <td className="font-mono">{when(p.updatedAt)}</td>
              <td>{p.robots.length === 0 ? <span className="text-ink-500">none</span> : p.robots.map((r) => r.name).join(", ")}</td>
              {admin && (
                <td className="text-right">
                  <Link href={`/floorplans/${p.id}#editor`} className="text-ink-300 underline underline-offset-2" aria-label={`Edit ${p.name}`}>
                    Edit
                  </Link>
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
      {plans.length === 0 && <p className="rounded border border-dashed border-ink-700 p-4 text-sm text-ink-300">No floorplans yet{admin ? "; import one from an image or a CSV grid." : "."}</p>}
    </section>
  );
}
