import { actorOf, pushRobotGains, route } from "@/server/facade";

export const dynamic = "force-dynamic";

/** Pushes the robot's saved heading gains to it with `tune`; 422 when it is not connected. */
export const POST = route({ role: "admin", surface: "tune" }, async ({ params, user }) => pushRobotGains(params.id, actorOf(user!)));
