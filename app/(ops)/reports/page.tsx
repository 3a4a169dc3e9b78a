import type { Metadata } from "next";
import { ComingLater } from "@/components/shell/ComingLater";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Reports" };

export default async function Page() {
  await requirePageRole("viewer", "/reports");
  return <ComingLater title="Reports" what="The shift summary and its e-mail digest arrive with the logbook." />;
}
