import type { Metadata } from "next";
import { ComingLater } from "@/components/shell/ComingLater";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Logbook" };

export default async function Page() {
  await requirePageRole("viewer", "/logbook");
  return <ComingLater title="Logbook" what="Missions, their timelines and exact belief replay arrive with the logbook." />;
}
