import { actorOf, retireRobot, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "admin", surface: "retire" }, async ({ params, user }) => ({ robot: await retireRobot(params.id, actorOf(user!)) }));
