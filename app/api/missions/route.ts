import { OpsCommandSchemas } from "@/lib/protocol";
import { route, runCommand, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "operator", surface: "missions", body: OpsCommandSchemas.dispatch }, async ({ body, user }) => {
  const result = await runCommand(runningFleet(), "dispatch", body, user!);
  return Response.json(result, { status: 201 });
});
