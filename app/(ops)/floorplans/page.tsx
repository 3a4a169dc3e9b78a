import type { Metadata } from "next";
import { ComingLater } from "@/components/shell/ComingLater";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Floorplans" };

export default async function Page() {
  await requirePageRole("viewer", "/floorplans");
  return <ComingLater title="Floorplans" what="The tile editor and image or CSV import arrive with the admin screens." />;
}
