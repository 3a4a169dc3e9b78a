import { route, sendMemberLink, userIdParam } from "@/server/facade";

export const dynamic = "force-dynamic";

/** E-mails the user a password reset, or the invite again when they have not set a password yet. */
export const POST = route({ role: "admin", surface: "users" }, async ({ user, params }) => {
  return Response.json(await sendMemberLink(user!, userIdParam(params.id, "users")), { status: 202 });
});
