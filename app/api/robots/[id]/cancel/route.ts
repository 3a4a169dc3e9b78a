import { robotFrameNow, route, runCommand, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "operator", surface: "cancel" }, async ({ params, user }) => {
  await runCommand(runningFleet(), "cancel", { robotId: params.id }, user!);
  return { robot: await robotFrameNow(params.id) };
});
