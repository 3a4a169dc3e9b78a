import type { Metadata } from "next";
import { ComingLater } from "@/components/shell/ComingLater";
import { requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Live floor" };

export default async function Page() {
  await requirePageRole("viewer", "/floor");
  return <ComingLater title="Live floor" what="The shared floor view with every robot's belief, dispatch and holds arrives with the fleet service." />;
}
