import { OpsCommandSchemas } from "@/lib/protocol";
import { listMissions, MissionListQuery, route, runCommand, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "missions", query: MissionListQuery }, async ({ query }) => listMissions(query));

export const POST = route({ role: "operator", surface: "missions", body: OpsCommandSchemas.dispatch }, async ({ body, user }) => {
  const result = await runCommand(runningFleet(), "dispatch", body, user!);
  return Response.json(result, { status: 201 });
});
