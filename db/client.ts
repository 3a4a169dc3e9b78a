/**
 * The only place that opens a MariaDB pool. The pool lives on globalThis so the custom
 * server and the route handlers Next bundles apart from it share one set of connections.
 */
import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "./schema";

export type Db = MySql2Database<typeof schema>;

interface DbHandle {
  url: string;
  pool: mysql.Pool;
  db: Db;
}

const registry = globalThis as unknown as { __tesseraDb?: DbHandle };

/** Opens (once per process) the pool for `url` and returns the Drizzle handle. */
export function openDb(url: string): Db {
  if (registry.__tesseraDb && registry.__tesseraDb.url === url) return registry.__tesseraDb.db;
  const pool = mysql.createPool({ uri: url, connectionLimit: 10, timezone: "Z", dateStrings: false });
  const db = drizzle(pool, { schema, mode: "default" });
  registry.__tesseraDb = { url, pool, db };
  return db;
}

/** The pool opened by openDb, for raw health pings; undefined before the first open. */
export function currentPool(): mysql.Pool | undefined {
  return registry.__tesseraDb?.pool;
}

/** Ends the pool; later openDb calls open a new one. */
export async function closeDb(): Promise<void> {
  const handle = registry.__tesseraDb;
  registry.__tesseraDb = undefined;
  if (handle) await handle.pool.end();
}
