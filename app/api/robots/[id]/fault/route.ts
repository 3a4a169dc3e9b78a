import { SimFaultSchema } from "@/lib/protocol";
import { robotFrameNow, route, runCommand, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "admin", surface: "fault", body: SimFaultSchema }, async ({ params, body, user }) => {
  await runCommand(runningFleet(), "fault", { robotId: params.id, fault: body }, user!);
  return { robot: await robotFrameNow(params.id) };
});
