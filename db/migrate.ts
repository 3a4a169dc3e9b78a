/** Applies the committed drizzle-kit migrations in db/migrations. */
import { fileURLToPath } from "node:url";
import { migrate } from "drizzle-orm/mysql2/migrator";
import type { Db } from "./client";

const MIGRATIONS = fileURLToPath(new URL("./migrations", import.meta.url));

export async function migrateDb(db: Db): Promise<void> {
  await migrate(db, { migrationsFolder: MIGRATIONS });
}
