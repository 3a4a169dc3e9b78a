/**
 * Demo data of Tessera's own invented site. Idempotent: running it again leaves
 * existing rows (and anything users changed) alone.
 */
import bcrypt from "bcryptjs";
import type { Db } from "./client";
import { users } from "./schema";
import type { Role } from "../lib/vocabulary";

export const DEMO_USERS: readonly { email: string; name: string; role: Role }[] = [
  { email: "admin@tessera.test", name: "Ada Okafor", role: "admin" },
  { email: "operator@tessera.test", name: "Tomás Reyes", role: "operator" },
  { email: "viewer@tessera.test", name: "Mei Lindqvist", role: "viewer" },
];

export async function seedDemo(db: Db, opts: { demoPassword: string }): Promise<void> {
  const passwordHash = await bcrypt.hash(opts.demoPassword, 10);
  for (const user of DEMO_USERS) {
    await db.insert(users).ignore().values({ ...user, passwordHash });
  }
}
