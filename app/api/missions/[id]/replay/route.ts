import { z } from "zod";
import { quantiseMarginal } from "@/lib/protocol";
import { tileMarginal } from "@/lib/belief";
import { missionIdParam, replayMission, replayView, route, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

const ReplayQuery = z.object({ step: z.coerce.number().int().min(0).optional() });

export const GET = route({ role: "viewer", surface: "replay", query: ReplayQuery }, async ({ params, query }) => {
  const fleet = runningFleet();
  const result = await replayMission(fleet, missionIdParam(params.id, "replay"), query.step);
  const plan = await fleet.planOf(result.mission.versionId);
  return replayView(result, quantiseMarginal(tileMarginal(plan, result.belief)));
});
