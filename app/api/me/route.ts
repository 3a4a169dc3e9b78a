import { MePatchSchema } from "@/lib/crew/schemas";
import { myProfile, route, updateMe } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "me" }, async ({ user }) => ({ user: await myProfile(user!) }));

export const PATCH = route({ role: "viewer", surface: "me", body: MePatchSchema }, async ({ body, user }) => ({ user: await updateMe(user!, body) }));
