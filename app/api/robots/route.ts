import { registerRobot, RegisterRobotSchema, route, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "robots" }, async () => ({ robots: runningFleet().frames() }));

export const POST = route({ role: "admin", surface: "robots", body: RegisterRobotSchema }, async ({ body }) => {
  return Response.json(await registerRobot(body), { status: 201 });
});
