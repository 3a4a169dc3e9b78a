import { WhatIfSchema } from "@/lib/protocol/what-if";
import { certaintyCurve, missionIdParam, route, runningFleet } from "@/server/facade";

export const dynamic = "force-dynamic";

/** The mission's certainty after every step, replayed with the robot's own models. */
export const GET = route({ role: "viewer", surface: "certainty" }, async ({ params }) => {
  return certaintyCurve(runningFleet(), missionIdParam(params.id, "certainty"));
});

/** The same curve beside one replayed with the what-if parameters in the body. */
export const POST = route({ role: "viewer", surface: "certainty", body: WhatIfSchema }, async ({ params, body }) => {
  const id = missionIdParam(params.id, "certainty");
  const fleet = runningFleet();
  const [baseline, whatIf] = await Promise.all([certaintyCurve(fleet, id), certaintyCurve(fleet, id, body)]);
  return { baseline, whatIf };
});
