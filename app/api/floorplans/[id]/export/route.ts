import { z } from "zod";
import { exportFloorplan, floorplanIdParam, route } from "@/server/facade";

export const dynamic = "force-dynamic";

const ExportQuery = z.object({ format: z.enum(["csv", "json"]).default("csv"), version: z.coerce.number().int().positive().optional() });

export const GET = route({ role: "viewer", surface: "export", query: ExportQuery }, async ({ params, query }) => exportFloorplan(floorplanIdParam(params.id), query.format, query.version));
