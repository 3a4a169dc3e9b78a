import { floorplanSummaries, importFloorplanUpload, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "floorplans" }, async () => ({ floorplans: await floorplanSummaries() }));

export const POST = route({ role: "admin", surface: "floorplans" }, async ({ req, user }) => Response.json(await importFloorplanUpload(req, user), { status: 201 }));
