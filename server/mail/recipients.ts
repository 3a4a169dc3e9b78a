/** Who is on call: the enabled users an admin marked on the Crew page. */
import { and, eq, isNull } from "drizzle-orm";
import type { Db } from "../../db/client";
import { users } from "../../db/schema";

export async function onCallRecipients(db: Db): Promise<string[]> {
  const rows = await db
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.onCall, true), isNull(users.disabledAt)))
    .orderBy(users.email);
  return rows.map((r) => r.email);
}
