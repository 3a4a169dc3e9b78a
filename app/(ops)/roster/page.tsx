import type { Metadata } from "next";
import { ComingLater } from "@/components/shell/ComingLater";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Roster" };

export default async function Page() {
  await requirePageRole("viewer", "/roster");
  return <ComingLater title="Roster" what="Robot registration, keys and tuning arrive with the admin screens." />;
}
