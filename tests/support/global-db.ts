/**
 * Integration tests get their own private MariaDB instance (never the demo's) and a
 * freshly migrated database each run.
 */
import type { TestProject } from "vitest/node";
import { prepareDatabase } from "../../scripts/local-env";

export const TEST_DB_PORT = Number(process.env.TESSERA_TEST_DB_PORT ?? 3417);

export default async function setup(project: TestProject) {
  const db = await prepareDatabase({ instance: "mariadb-it", port: TEST_DB_PORT, database: "tessera_it", fresh: true, seed: { demoPassword: "demo-tessera" } });
  project.provide("databaseUrl", db.url);
  return async () => {
    await db.local?.stop();
  };
}

declare module "vitest" {
  export interface ProvidedContext {
    databaseUrl: string;
    appUrl: string;
  }
}
