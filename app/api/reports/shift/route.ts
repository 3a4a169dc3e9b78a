import { ShiftQuerySchema } from "@/lib/protocol/reports";
import { route, shiftReport, shiftReportCsv } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "reports", query: ShiftQuerySchema }, async ({ query }) => {
  const { format, ...range } = query;
  return format === "csv" ? shiftReportCsv(range) : shiftReport(range);
});
