import { missionDetail, route, TesseraError } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "mission" }, async ({ params }) => {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) throw new TesseraError("bad_request", "mission", `Mission id "${params.id}" is not a positive integer.`);
  return missionDetail(id);
});
