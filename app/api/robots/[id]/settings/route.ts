import { z } from "zod";
import { actorOf, parseRobotSettings, resetRobotSettings, robotSettings, route, saveRobotSettings } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "settings" }, async ({ params }) => robotSettings(params.id));

// The body is checked by parseRobotSettings, so out-of-range values answer 422 with their field paths.
export const PUT = route({ role: "admin", surface: "settings", body: z.unknown() }, async ({ params, body, user }) =>
  saveRobotSettings(params.id, parseRobotSettings(body), actorOf(user!)),
);

/** Back to the defaults of the robot's drive. */
export const DELETE = route({ role: "admin", surface: "settings" }, async ({ params, user }) => resetRobotSettings(params.id, actorOf(user!)));
