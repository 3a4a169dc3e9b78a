import { SaveVersionBodySchema } from "@/lib/protocol/floorplans";
import { floorplanIdParam, route, saveFloorplanVersion } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "admin", surface: "floorplan", body: SaveVersionBodySchema }, async ({ params, body, user }) => {
  return Response.json(await saveFloorplanVersion(floorplanIdParam(params.id), body, user), { status: 201 });
});
