import { z } from "zod";
import { actorOf, listRoster, registerRobot, RegisterRobotSchema, route } from "@/server/facade";

export const dynamic = "force-dynamic";

const RosterQuery = z.object({ retired: z.enum(["0", "1"]).optional() });

export const GET = route({ role: "viewer", surface: "robots", query: RosterQuery }, async ({ query }) => ({ robots: await listRoster({ retired: query.retired === "1" }) }));

export const POST = route({ role: "admin", surface: "robots", body: RegisterRobotSchema }, async ({ body, user }) => {
  return Response.json(await registerRobot(body, actorOf(user!)), { status: 201 });
});
