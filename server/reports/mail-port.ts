/**
 * Where the digest gets its mail sender and its recipients. Until a mailer is set up the
 * sender refuses with 503, so "Send digest now" says plainly that e-mail is off rather
 * than pretending to have sent anything.
 */
import { and, eq, isNull } from "drizzle-orm";
import type { Db } from "../../db/client";
import { users } from "../../db/schema";
import { TesseraError } from "../errors";

export interface MailMessage {
  to: string[];
  subject: string;
  text: string;
  html: string;
}

export type MailSender = (message: MailMessage) => Promise<void>;

const unconfigured: MailSender = async () => {
  throw new TesseraError("unavailable", "digest", "E-mail is not configured on this server, so the digest was not sent.");
};

/** The process's mail sender. */
export function mailSender(): MailSender {
  return unconfigured;
}

/** Addresses of the enabled users marked on call, the digest's recipients. */
export async function onCallRecipients(db: Db): Promise<string[]> {
  const rows = await db
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.onCall, true), isNull(users.disabledAt)))
    .orderBy(users.email);
  return rows.map((r) => r.email);
}
