import { z } from "zod";
import { appDbForRoutes, missionIdParam, photoBytes, route, TesseraError } from "@/server/facade";

export const dynamic = "force-dynamic";

const PhotoQuery = z.object({ size: z.enum(["full", "thumb"]).default("full") });

export const GET = route({ role: "viewer", surface: "notes", query: PhotoQuery }, async ({ params, query }) => {
  const photoId = Number(params.photoId);
  if (!Number.isInteger(photoId) || photoId <= 0) throw new TesseraError("bad_request", "notes", `"${params.photoId}" is not a photo id.`);
  const photo = await photoBytes(appDbForRoutes(), missionIdParam(params.id, "notes"), photoId, query.size);
  return new Response(new Uint8Array(photo.bytes), {
    headers: { "content-type": photo.mime, "cache-control": "private, max-age=86400, immutable", "x-content-type-options": "nosniff" },
  });
});
