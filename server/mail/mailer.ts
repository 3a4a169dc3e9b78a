/**
 * Outgoing mail through nodemailer over SMTP: a real provider when SMTP_HOST is set,
 * otherwise Tessera's own catcher on loopback, so invites work without a mailbox.
 */
import nodemailer, { type Transporter } from "nodemailer";
import { mailConfig, type MailConfig } from "../config";
import { appDb } from "../db";
import { logger } from "../logger";
import { onCallRecipients } from "./recipients";

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html: string;
}

let cached: { key: string; transport: Transporter } | undefined;

function transportOptions(c: MailConfig) {
  if (!c.SMTP_HOST) {
    // The catcher offers neither TLS nor AUTH: it only listens on 127.0.0.1.
    return { host: "127.0.0.1", port: c.MAIL_CATCHER_PORT, secure: false, ignoreTLS: true };
  }
  return {
    host: c.SMTP_HOST,
    port: c.SMTP_PORT,
    // Port 465 speaks TLS from the first byte; the others upgrade with STARTTLS when offered.
    secure: c.SMTP_PORT === 465,
    auth: c.SMTP_USER ? { user: c.SMTP_USER, pass: c.SMTP_PASSWORD ?? "" } : undefined,
  };
}

function transport(): Transporter {
  const options = transportOptions(mailConfig());
  const key = JSON.stringify(options);
  if (cached?.key !== key) cached = { key, transport: nodemailer.createTransport({ ...options, connectionTimeout: 10_000, greetingTimeout: 10_000 }) };
  return cached.transport;
}

/** Sends one message with a text and an HTML part; rejects when the SMTP server refuses it. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  const info = await transport().sendMail({ from: mailConfig().MAIL_FROM, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
  logger.info({ to: mail.to, subject: mail.subject, messageId: info.messageId }, "mail sent");
}

/**
 * E-mails every active on-call user; resolves to how many were addressed (0 sends nothing).
 * Each gets a message of their own, so recipients do not see one another's addresses.
 */
export async function mailOnCall(subject: string, text: string, html: string): Promise<number> {
  const recipients = await onCallRecipients(appDb());
  await sendEach({ to: recipients, subject, text, html });
  return recipients.length;
}

/** Sends one copy per address, so recipients do not see one another's addresses. */
export async function sendEach(mail: { to: string[]; subject: string; text: string; html: string }): Promise<void> {
  await Promise.all(mail.to.map((to) => sendMail({ ...mail, to })));
}
