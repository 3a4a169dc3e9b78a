import { z } from "zod";
import { exportMissionEvents, missionDetail, missionIdParam, route } from "@/server/facade";

export const dynamic = "force-dynamic";

const ExportQuery = z.object({ format: z.enum(["csv", "json"]).default("csv") });

export const GET = route({ role: "viewer", surface: "export", query: ExportQuery }, async ({ params, query }) => {
  const id = missionIdParam(params.id, "export");
  await missionDetail(id);
  return new Response(exportMissionEvents(id, query.format), {
    headers: {
      "content-type": query.format === "csv" ? "text/csv; charset=utf-8" : "application/json; charset=utf-8",
      "content-disposition": `attachment; filename="tessera-mission-${id}-events.${query.format}"`,
    },
  });
});
