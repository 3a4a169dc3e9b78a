/** The sent-mail page's query: what the catcher kept, newest first, paged on the server. */
import { count, desc } from "drizzle-orm";
import { z } from "zod";
import { caughtMail } from "../../db/schema";
import type { CaughtMail } from "../../lib/crew/schemas";
import { appDb } from "../db";

export const MailListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  limit: z.coerce.number().int().min(1).max(100).default(20),
});
export type MailListQuery = z.infer<typeof MailListQuery>;

export async function listCaughtMail(q: MailListQuery): Promise<{ items: CaughtMail[]; total: number }> {
  const db = appDb();
  const [{ total }] = await db.select({ total: count() }).from(caughtMail);
  const rows = await db
    .select()
    .from(caughtMail)
    .orderBy(desc(caughtMail.receivedAt), desc(caughtMail.id))
    .limit(q.limit)
    .offset((q.page - 1) * q.limit);
  return {
    total,
    items: rows.map((m) => ({ id: m.id, from: m.from, to: m.to, subject: m.subject, text: m.text, html: m.html, receivedAt: m.receivedAt.getTime() })),
  };
}
