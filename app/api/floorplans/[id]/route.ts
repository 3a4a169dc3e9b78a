import { z } from "zod";
import { floorplanDetail, floorplanIdParam, route } from "@/server/facade";

export const dynamic = "force-dynamic";

const DetailQuery = z.object({ version: z.coerce.number().int().positive().optional() });

export const GET = route({ role: "viewer", surface: "floorplan", query: DetailQuery }, async ({ params, query }) => floorplanDetail(floorplanIdParam(params.id), query.version));
