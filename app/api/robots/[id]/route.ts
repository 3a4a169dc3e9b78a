import { robotDetail, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "robot" }, async ({ params }) => robotDetail(params.id));
