/** The audit trail: who did what to which target, written beside each action and listed for admins. */
import { and, count, desc, eq, gte, lte, type SQL } from "drizzle-orm";
import { z } from "zod";
import type { Db } from "../../db/client";
import { audit, users } from "../../db/schema";
import type { AuditItem } from "../../lib/crew/schemas";
import { appDb } from "../db";

/** Writes one audit row; pass the transaction when the action is one, so both commit together. */
export async function writeAudit(db: Pick<Db, "insert">, userId: number | null, action: string, target: string, detail: Record<string, unknown> = {}): Promise<void> {
  await db.insert(audit).values({ userId, action, target, detail });
}

const dateBound = (end: boolean) =>
  z
    .string()
    .refine((v) => !Number.isNaN(Date.parse(v)), "Give a date such as 2026-12-01 or an ISO time.")
    // A bare day as the upper bound means the whole of that day (UTC).
    .transform((v) => (end && /^\d{4}-\d{2}-\d{2}$/.test(v) ? new Date(Date.parse(v) + 86_400_000 - 1) : new Date(v)));

export const AuditQuery = z.object({
  user: z.coerce.number().int().positive().optional(),
  action: z.string().trim().min(1).max(60).optional(),
  from: dateBound(false).optional(),
  to: dateBound(true).optional(),
  page: z.coerce.number().int().min(1).default(1),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type AuditQuery = z.infer<typeof AuditQuery>;

/** One page of audit rows, newest first, with the total for the filters (audit_at_idx orders them). */
export async function listAudit(q: AuditQuery): Promise<{ items: AuditItem[]; total: number }> {
  const db = appDb();
  const where: SQL[] = [];
  if (q.user) where.push(eq(audit.userId, q.user));
  if (q.action) where.push(eq(audit.action, q.action));
  if (q.from) where.push(gte(audit.at, q.from));
  if (q.to) where.push(lte(audit.at, q.to));
  const condition = where.length ? and(...where) : undefined;
  // One repeatable-read transaction reads the count and the page from the same snapshot,
  // so actions recorded in between cannot make the two disagree.
  const { total, rows } = await db.transaction(async (tx) => {
    const [{ total }] = await tx.select({ total: count() }).from(audit).where(condition);
    const rows = await tx
      .select({ row: audit, userName: users.name })
      .from(audit)
      .leftJoin(users, eq(users.id, audit.userId))
      .where(condition)
      .orderBy(desc(audit.at), desc(audit.id))
      .limit(q.limit)
      .offset((q.page - 1) * q.limit);
    return { total, rows };
  }, { isolationLevel: "repeatable read", accessMode: "read only" });
  return {
    total,
    items: rows.map(({ row, userName }) => ({
      id: row.id,
      at: row.at.getTime(),
      userId: row.userId,
      userName,
      action: row.action,
      target: row.target,
      detail: row.detail,
    })),
  };
}

/** The actions that occur in the trail, for the page's filter. */
export async function auditActions(): Promise<string[]> {
  const rows = await appDb().selectDistinct({ action: audit.action }).from(audit).orderBy(audit.action);
  return rows.map((r) => r.action);
}
