/**
 * What `npm start`, `npm run dev` and the tests share: the generated secrets under .data/
 * and the private MariaDB (unless DATABASE_URL points elsewhere).
 */
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { closeDb, openDb } from "../db/client";
import { startLocalMariadb, type LocalMariadb } from "../db/local-mariadb";
import { migrateDb } from "../db/migrate";
import { seedDemoFleet, seedDemoFloorplan, seedDemoUsers, type DemoFleetCredentials } from "../db/seed";

export const ROOT = path.resolve(import.meta.dirname, "..");
export const DATA_DIR = path.join(ROOT, ".data");

/** A secret kept in .data/, generated on first use. */
export function keptSecret(name: string, bytes = 32): string {
  mkdirSync(DATA_DIR, { recursive: true });
  const file = path.join(DATA_DIR, name);
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  const value = randomBytes(bytes).toString("base64url");
  writeFileSync(file, `${value}\n`, { mode: 0o600 });
  return value;
}

export interface PreparedDb {
  url: string;
  local?: LocalMariadb;
  /** The demo robots' ids and keys, when seeded. */
  fleet?: DemoFleetCredentials;
}

function readKnownKeys(file: string): Record<string, string> {
  if (!existsSync(file)) return {};
  try {
    const parsed = JSON.parse(readFileSync(file, "utf8")) as DemoFleetCredentials;
    return Object.fromEntries(parsed.robots.map((r) => [r.id, r.key]));
  } catch {
    return {};
  }
}

/** Brings up the database (private instance unless DATABASE_URL is set) and migrates it. */
export async function prepareDatabase(opts: {
  instance: string;
  port: number;
  database: string;
  fresh?: boolean;
  /** Seeds the demo; the fleet's keys are kept in `fleetFile` (under .data/) across runs. */
  seed?: { demoPassword: string; fleetFile?: string; onCall?: readonly string[] };
  log?: (line: string) => void;
}): Promise<PreparedDb> {
  const log = opts.log ?? ((line: string) => console.log(`tessera: ${line}`));
  let url = process.env.DATABASE_URL;
  let local: LocalMariadb | undefined;
  if (!url) {
    local = await startLocalMariadb({
      dir: path.join(DATA_DIR, opts.instance),
      port: opts.port,
      databases: [opts.database],
      user: "tessera",
      password: keptSecret(`${opts.instance}-password`, 18),
      log,
    });
    url = local.url(opts.database);
  }
  const db = openDb(url);
  if (opts.fresh) {
    await db.execute(`DROP DATABASE IF EXISTS \`${opts.database}\``);
    await db.execute(`CREATE DATABASE \`${opts.database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await closeDb();
  }
  const fresh = openDb(url);
  await migrateDb(fresh);
  let fleet: DemoFleetCredentials | undefined;
  if (opts.seed) {
    await seedDemoUsers(fresh, opts.seed);
    const floorplanId = await seedDemoFloorplan(fresh);
    const file = opts.seed.fleetFile;
    fleet = await seedDemoFleet(fresh, floorplanId, file ? readKnownKeys(file) : {});
    if (file) writeFileSync(file, `${JSON.stringify(fleet, null, 2)}\n`, { mode: 0o600 });
  }
  await closeDb();
  return { url, local, fleet };
}
