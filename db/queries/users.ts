import { eq } from "drizzle-orm";
import type { Db } from "../client";
import { users, type User } from "../schema";

export async function findUserByEmail(db: Db, email: string): Promise<User | undefined> {
  const rows = await db.select().from(users).where(eq(users.email, email.toLowerCase())).limit(1);
  return rows[0];
}

export async function findUserById(db: Db, id: number): Promise<User | undefined> {
  if (!Number.isSafeInteger(id) || id <= 0) return undefined;
  const rows = await db.select().from(users).where(eq(users.id, id)).limit(1);
  return rows[0];
}
