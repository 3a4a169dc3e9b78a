import type { Metadata } from "next";
import { ComingLater } from "@/components/shell/ComingLater";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Crew" };

export default async function Page() {
  await requirePageRole("admin", "/crew");
  return <ComingLater title="Crew" what="Users, roles and invites arrive with the admin screens." />;
}
