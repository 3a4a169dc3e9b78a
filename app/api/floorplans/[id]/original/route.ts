import { z } from "zod";
import { floorplanIdParam, floorplanOriginal, route } from "@/server/facade";

export const dynamic = "force-dynamic";

const OriginalQuery = z.object({ version: z.coerce.number().int().positive() });

export const GET = route({ role: "admin", surface: "floorplan", query: OriginalQuery }, async ({ params, query }) => floorplanOriginal(floorplanIdParam(params.id), query.version));
