import { EventPageQuery, missionEvents, missionIdParam, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "events", query: EventPageQuery }, async ({ params, query }) =>
  missionEvents(missionIdParam(params.id, "events"), query.after, query.limit),
);
