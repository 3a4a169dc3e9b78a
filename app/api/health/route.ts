import { healthReport, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "public", surface: "health" }, async () => {
  const report = await healthReport();
  return Response.json(report, { status: report.ok ? 200 : 503 });
});
