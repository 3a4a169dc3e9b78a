import { z } from "zod";
import { HEADINGS } from "@/lib/vocabulary";
import { robotFrameNow, route, runCommand, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

const RelocateBody = z.object({ row: z.number().int().min(0), col: z.number().int().min(0), heading: z.enum(HEADINGS).optional() });

export const POST = route({ role: "operator", surface: "relocate", body: RelocateBody }, async ({ params, body, user }) => {
  await runCommand(runningFleet(), "relocate", { robotId: params.id, ...body }, user!);
  return { robot: await robotFrameNow(params.id) };
});
