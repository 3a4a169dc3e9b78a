import { InviteSchema } from "@/lib/crew/schemas";
import { inviteMember, listCrew, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "admin", surface: "users" }, async () => ({ users: await listCrew() }));

/** Invites a user by e-mail: 201 with the new (invited) member once the mail is handed to SMTP. */
export const POST = route({ role: "admin", surface: "users", body: InviteSchema }, async ({ body, user }) => {
  return Response.json({ user: await inviteMember(user!, body) }, { status: 201 });
});
