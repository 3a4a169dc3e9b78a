/** What GET /api/health reports: the app version and whether MariaDB answers. */
import { currentPool } from "../db/client";
import { appDb } from "./db";

export const APP_VERSION = "0.1.0";

export async function healthReport(): Promise<{ ok: boolean; db: boolean; version: string }> {
  let db = false;
  try {
    appDb();
    const pool = currentPool();
    if (pool) {
      await pool.query("SELECT 1");
      db = true;
    }
  } catch {
    db = false;
  }
  return { ok: db, db, version: APP_VERSION };
}
