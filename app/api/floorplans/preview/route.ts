import { previewFloorplanUpload, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "admin", surface: "floorplans" }, async ({ req }) => previewFloorplanUpload(req));
