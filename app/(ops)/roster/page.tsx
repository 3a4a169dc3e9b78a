import type { Metadata } from "next";
import { RosterScreen } from "@/components/roster/RosterScreen";
import { floorplanChoices, listRoster, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Roster" };

export default async function Page() {
  const user = await requirePageRole("viewer", "/roster");
  const [robots, floorplans] = await Promise.all([listRoster(), floorplanChoices()]);
  return <RosterScreen robots={robots} floorplans={floorplans} isAdmin={user.role === "admin"} />;
}
