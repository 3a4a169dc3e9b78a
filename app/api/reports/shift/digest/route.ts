import { DigestRequestSchema } from "@/lib/protocol/reports";
import { route, sendShiftDigestNow } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "operator", surface: "digest", body: DigestRequestSchema }, async ({ body }) => sendShiftDigestNow(body));
