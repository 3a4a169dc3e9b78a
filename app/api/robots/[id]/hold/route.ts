import { robotFrameNow, route, runCommand, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "operator", surface: "hold" }, async ({ params, user }) => {
  await runCommand(runningFleet(), "hold", { robotId: params.id }, user!);
  return { robot: await robotFrameNow(params.id) };
});
