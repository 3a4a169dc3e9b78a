import { actorOf, rotateRobotKey, route } from "@/server/facade";

export const dynamic = "force-dynamic";

/** A new secret key, answered this once; the old key stops working and a live link is closed. */
export const POST = route({ role: "admin", surface: "key" }, async ({ params, user }) => rotateRobotKey(params.id, actorOf(user!)));
