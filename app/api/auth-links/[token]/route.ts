import { SetPasswordSchema } from "@/lib/crew/schemas";
import { acceptLink, linkState, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "public", surface: "auth-links" }, async ({ params }) => {
  const link = await linkState(params.token ?? "");
  return link.state === "valid" ? { state: link.state, kind: link.kind, name: link.name } : link;
});

/** Sets the password through an invite or reset link; 410 once the link is used or expired. */
export const POST = route({ role: "public", surface: "auth-links", body: SetPasswordSchema }, async ({ body, params }) => {
  return acceptLink(params.token ?? "", body.password);
});
