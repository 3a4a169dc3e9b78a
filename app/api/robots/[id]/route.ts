import { route, runningFleet, TesseraError } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "robot" }, async ({ params }) => {
  const runtime = runningFleet().robots.get(params.id);
  if (!runtime) throw new TesseraError("not_found", "robot", `There is no active robot ${params.id}.`);
  return { robot: runningFleet().frame(runtime) };
});
