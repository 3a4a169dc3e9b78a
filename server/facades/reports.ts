/** What app/ uses of the server for reports; re-exported by server/facade.ts. */
import { asc } from "drizzle-orm";
import { floorplans } from "../../db/schema";
import { shiftSummaryCsv } from "../../lib/reports/shift-csv";
import type { ShiftRange } from "../../lib/protocol/reports";
import { appDb } from "../db";
import { floorplanNameOf, sendShiftDigest } from "../reports/digest";
import { mailSender } from "../reports/mail-port";
import { shiftSummary } from "../reports/shift";

/** The shift summary of a range, from the app's database; 404 for an unknown floorplan. */
export async function shiftReport(range: ShiftRange) {
  await floorplanNameOf(appDb(), range.floorplanId, "reports");
  return shiftSummary(appDb(), range);
}

/** The shift summary of a range as a CSV download. */
export async function shiftReportCsv(range: ShiftRange): Promise<Response> {
  const csv = shiftSummaryCsv(await shiftReport(range));
  const day = (ms: number) => new Date(ms).toISOString().slice(0, 16).replace(/[-:]/g, "");
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="tessera-shift-${day(range.from)}-${day(range.to)}.csv"`,
    },
  });
}

/** Sends the digest of a range to the on-call list through the configured mailer. */
export function sendShiftDigestNow(range: ShiftRange) {
  return sendShiftDigest(appDb(), range, mailSender());
}

/** Every floorplan by name, for the report's picker. */
export function reportFloorplans(): Promise<{ id: number; name: string }[]> {
  return appDb().select({ id: floorplans.id, name: floorplans.name }).from(floorplans).orderBy(asc(floorplans.name));
}
