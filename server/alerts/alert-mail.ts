/**
 * Alert e-mails to the on-call list: automatic holds for low certainty, robots offline,
 * faults and failed missions. Rate-limited per robot, so a flapping robot sends one mail
 * per window, and the next mail says how many alerts were folded into it.
 */
import type { AlertKind } from "../../lib/vocabulary";
import { logger } from "../logger";

/** The alert kinds that wake someone; traffic waits and battery notes stay on the live floor. */
export const MAILED_ALERT_KINDS: readonly AlertKind[] = ["low_certainty", "offline", "fault", "mission_failed"];

export interface AlertEvent {
  id: number;
  robotId: string | null;
  kind: AlertKind;
  message: string;
  createdAt: number;
}

export interface OutgoingMail {
  to: string[];
  subject: string;
  text: string;
  html: string;
}

export interface AlertMailDeps {
  send: (mail: OutgoingMail) => Promise<void>;
  /** E-mail addresses of the on-call users, read when an alert is mailed. */
  recipients: () => Promise<string[]>;
  /** One mail per robot within this window. */
  windowMs: number;
  /** Where the live floor is, for the link in the mail. */
  publicUrl: string;
  robotName?: (robotId: string) => string | undefined;
  now?: () => number;
}

export type AlertMailOutcome = "sent" | "suppressed" | "not_mailed" | "no_recipients" | "failed";

const KIND_TITLES: Record<AlertKind, string> = {
  low_certainty: "held: low certainty",
  offline: "offline",
  fault: "fault",
  traffic: "traffic wait",
  battery: "battery",
  mission_failed: "mission failed",
};

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

export class AlertMailer {
  private readonly lastSent = new Map<string, number>();
  private readonly folded = new Map<string, number>();

  constructor(private readonly deps: AlertMailDeps) {}

  async handle(alert: AlertEvent): Promise<AlertMailOutcome> {
    if (!MAILED_ALERT_KINDS.includes(alert.kind)) return "not_mailed";
    const now = (this.deps.now ?? Date.now)();
    const key = alert.robotId ?? "fleet";
    const last = this.lastSent.get(key);
    if (last !== undefined && now - last < this.deps.windowMs) {
      this.folded.set(key, (this.folded.get(key) ?? 0) + 1);
      return "suppressed";
    }
    const to = await this.deps.recipients();
    if (to.length === 0) return "no_recipients";
    this.lastSent.set(key, now);
    const folded = this.folded.get(key) ?? 0;
    this.folded.delete(key);
    const name = (alert.robotId && this.deps.robotName?.(alert.robotId)) || alert.robotId || "The fleet";
    const subject = `Tessera: ${name} ${KIND_TITLES[alert.kind]}`;
    const when = new Date(alert.createdAt).toISOString().replace("T", " ").slice(0, 19);
    const extra = folded > 0 ? `${folded} earlier alert${folded > 1 ? "s" : ""} for ${name} in the last ${Math.round(this.deps.windowMs / 60000)} min ${folded > 1 ? "were" : "was"} not mailed separately.` : "";
    const link = `${this.deps.publicUrl.replace(/\/$/, "")}/floor`;
    const text = [`${alert.message}`, `At ${when} UTC.`, extra, `Live floor: ${link}`].filter(Boolean).join("\n\n");
    const html = [`<p>${escapeHtml(alert.message)}</p>`, `<p>At ${when} UTC.</p>`, extra ? `<p>${escapeHtml(extra)}</p>` : "", `<p><a href="${escapeHtml(link)}">Open the live floor</a></p>`].join("");
    try {
      await this.deps.send({ to, subject, text, html });
      return "sent";
    } catch (err) {
      // Not sent, so the next alert may try again, with this one counted.
      if (last === undefined) this.lastSent.delete(key);
      else this.lastSent.set(key, last);
      this.folded.set(key, folded + 1);
      logger.error({ err, alert: alert.id }, "alert e-mail could not be sent");
      return "failed";
    }
  }
}

/** Mails the fleet's alerts while attached; returns the detach function. */
export function attachAlertMail(fleet: { on(e: "alert", l: (a: AlertEvent) => void): unknown; off(e: "alert", l: (a: AlertEvent) => void): unknown }, deps: AlertMailDeps): () => void {
  const mailer = new AlertMailer(deps);
  const listener = (a: AlertEvent) => void mailer.handle(a).catch((err: unknown) => logger.error({ err, alert: a.id }, "alert e-mail failed"));
  fleet.on("alert", listener);
  return () => fleet.off("alert", listener);
}
