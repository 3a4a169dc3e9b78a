import { ResetRequestSchema } from "@/lib/crew/schemas";
import { requestReset, route } from "@/server/facade";

export const dynamic = "force-dynamic";

/** Always 202 with the same words, so the answer never tells whether the address has an account. */
export const POST = route({ role: "public", surface: "auth-links", body: ResetRequestSchema }, async ({ body }) => {
  await requestReset(body.email);
  return Response.json({ message: "If that address belongs to an active Tessera account, a reset link is on its way." }, { status: 202 });
});
