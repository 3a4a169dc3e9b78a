/**
 * The shift digest: the summary as an e-mail (subject, plain text and HTML with the same
 * figures), and its delivery through whichever mail sender the caller passes in.
 */
import { eq } from "drizzle-orm";
import type { Db } from "../../db/client";
import { floorplans } from "../../db/schema";
import { holdCount, type ShiftFigures, type ShiftRange, type ShiftSummary } from "../../lib/protocol/reports";
import { formatCertainty, formatDurationS, formatInstantUtc, HOLD_REASON_WORDS } from "../../lib/reports/format";
import { HOLD_REASONS } from "../../lib/vocabulary";
import { TesseraError } from "../errors";
import type { MailMessage, MailSender } from "./mail-port";
import { onCallRecipients } from "../mail/recipients";
import { shiftSummary } from "./shift";

export interface Digest {
  subject: string;
  text: string;
  html: string;
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);
}

function headline(f: ShiftFigures): [string, string][] {
  return [
    ["Missions started", String(f.started)],
    ["Reached", String(f.reached)],
    ["Aborted", String(f.aborted)],
    ["Failed", String(f.failed)],
    ["Still under way", String(f.active)],
    ["Time under way", formatDurationS(f.underWayS)],
    ["Median time to reach", formatDurationS(f.medianReachS)],
    ["Lowest certainty", formatCertainty(f.certaintyMin)],
    ["Mean lowest certainty", formatCertainty(f.certaintyMean)],
    ["Holds", String(holdCount(f.holds))],
  ];
}

const ROBOT_COLUMNS = ["Robot", "Started", "Reached", "Aborted", "Failed", "Under way", "Median to reach", "Lowest certainty", "Holds"];

function robotCells(r: ShiftSummary["robots"][number]): string[] {
  return [r.robotName, String(r.started), String(r.reached), String(r.aborted), String(r.failed), formatDurationS(r.underWayS), formatDurationS(r.medianReachS), formatCertainty(r.certaintyMin), String(holdCount(r.holds))];
}

/** The digest of a summary; `floorplanName` is null for a summary of every floorplan. */
export function composeDigest(summary: ShiftSummary, floorplanName: string | null): Digest {
  const where = floorplanName ?? "all floorplans";
  const span = `${formatInstantUtc(summary.from)} – ${formatInstantUtc(summary.to)}`;
  const t = summary.totals;
  const subject = `Tessera shift summary, ${where}: ${t.reached} of ${t.started} missions reached (${span})`;
  const holds = HOLD_REASONS.filter((r) => t.holds[r] > 0).map((r) => [HOLD_REASON_WORDS[r], String(t.holds[r])] as [string, string]);

  const text = [
    `Shift summary for ${where}`,
    span,
    "",
    ...headline(t).map(([k, v]) => `${k}: ${v}`),
    "",
    "Holds by reason:",
    ...(holds.length ? holds.map(([k, v]) => `  ${k}: ${v}`) : ["  none"]),
    "",
    "Per robot:",
    ...(summary.robots.length
      ? summary.robots.map((r) => `  ${r.robotName}: ${r.started} started, ${r.reached} reached, ${r.aborted} aborted, ${r.failed} failed; median to reach ${formatDurationS(r.medianReachS)}; lowest certainty ${formatCertainty(r.certaintyMin)}; ${holdCount(r.holds)} holds`)
      : ["  no missions in this range"]),
    "",
  ].join("\n");

  const cellStyle = 'style="padding:2px 8px;border-bottom:1px solid #d0d7de;text-align:left"';
  const row = (cells: string[], tag: "td" | "th") => `<tr>${cells.map((c) => `<${tag} ${cellStyle}>${escapeHtml(c)}</${tag}>`).join("")}</tr>`;
  const html = [
    `<h1 style="font-size:18px">Shift summary for ${escapeHtml(where)}</h1>`,
    `<p>${escapeHtml(span)}</p>`,
    `<table style="border-collapse:collapse">${headline(t).map(([k, v]) => row([k, v], "td")).join("")}</table>`,
    `<h2 style="font-size:15px">Holds by reason</h2>`,
    holds.length ? `<table style="border-collapse:collapse">${holds.map((h) => row(h, "td")).join("")}</table>` : "<p>none</p>",
    `<h2 style="font-size:15px">Per robot</h2>`,
    summary.robots.length
      ? `<table style="border-collapse:collapse">${row(ROBOT_COLUMNS, "th")}${summary.robots.map((r) => row(robotCells(r), "td")).join("")}</table>`
      : "<p>No missions in this range.</p>",
  ].join("\n");

  return { subject, text, html };
}

/** Composes the digest and hands it to `send`; refuses when there is no one to send it to. */
export async function deliverDigest(summary: ShiftSummary, opts: { to: string[]; floorplanName: string | null; send: MailSender }): Promise<MailMessage> {
  if (opts.to.length === 0) throw new TesseraError("unprocessable", "digest", "No one is on the on-call list, so there is no one to send the digest to.");
  const message = { to: opts.to, ...composeDigest(summary, opts.floorplanName) };
  await opts.send(message);
  return message;
}

/** The name of the floorplan a range is limited to (null for every floorplan); 404 for an unknown one. */
export async function floorplanNameOf(db: Db, floorplanId: number | undefined, surface: string): Promise<string | null> {
  if (floorplanId === undefined) return null;
  const row = (await db.select({ name: floorplans.name }).from(floorplans).where(eq(floorplans.id, floorplanId)).limit(1))[0];
  if (!row) throw new TesseraError("not_found", surface, `Floorplan ${floorplanId} does not exist.`);
  return row.name;
}

/** Summarises the range and sends its digest to the on-call list; answers who got what. */
export async function sendShiftDigest(db: Db, range: ShiftRange, send: MailSender): Promise<{ to: string[]; subject: string }> {
  const floorplanName = await floorplanNameOf(db, range.floorplanId, "digest");
  const summary = await shiftSummary(db, range);
  const message = await deliverDigest(summary, { to: await onCallRecipients(db), floorplanName, send });
  return { to: message.to, subject: message.subject };
}
