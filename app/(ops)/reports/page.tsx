import type { Metadata } from "next";
import { ShiftReport } from "@/components/reports/ShiftReport";
import { roleAllows } from "@/lib/roles";
import { reportFloorplans, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Reports" };

export default async function Page() {
  const user = await requirePageRole("viewer", "/reports");
  const floorplans = await reportFloorplans();
  return <ShiftReport floorplans={floorplans} initialTo={Date.now()} canSendDigest={roleAllows(user.role, "operator")} />;
}
