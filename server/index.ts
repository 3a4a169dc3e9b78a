/**
 * Tessera's process entry: one HTTP server on one port; Next.js renders pages and API
 * routes, socket.io serves /robot and /ops beside it.
 */
import nextEnv from "@next/env";
import { config } from "./config";

// Env files first: the modules below read configuration lazily, after this has run.
nextEnv.loadEnvConfig(process.cwd(), process.env.NODE_ENV !== "production");

// Missing secrets end the process here, with the variables named and no stack trace, before
// Next loads or prepares anything.
try {
  config();
} catch (err) {
  process.stderr.write(`${(err as Error).message}\n`);
  process.exit(1);
}

const { startTessera } = await import("./main");
await startTessera();
