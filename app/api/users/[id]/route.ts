import { UserPatchSchema } from "@/lib/crew/schemas";
import { changeMember, route, userIdParam } from "@/server/facade";

export const dynamic = "force-dynamic";

export const PATCH = route({ role: "admin", surface: "users", body: UserPatchSchema }, async ({ body, user, params }) => {
  return { user: await changeMember(user!, userIdParam(params.id, "users"), body) };
});
