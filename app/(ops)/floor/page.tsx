import type { Metadata } from "next";
import { LiveFloor } from "@/components/floor/LiveFloor";
import { liveFloorSnapshot, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Live floor" };

function floorplanParam(raw: string | string[] | undefined): number | undefined {
  const value = Array.isArray(raw) ? raw[0] : raw;
  return value !== undefined && /^\d{1,9}$/.test(value) ? Number(value) : undefined;
}

export default async function Page({ searchParams }: { searchParams: Promise<{ floorplan?: string | string[] }> }) {
  const user = await requirePageRole("viewer", "/floor");
  const snapshot = await liveFloorSnapshot(floorplanParam((await searchParams).floorplan));
  // A new floorplan gets a fresh store and socket room rather than a patched one.
  return <LiveFloor key={snapshot.floorplan.id} snapshot={snapshot} role={user.role} />;
}
