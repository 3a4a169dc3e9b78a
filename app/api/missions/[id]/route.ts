import { missionDetail, missionIdParam, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "mission" }, async ({ params }) => missionDetail(missionIdParam(params.id, "mission")));
