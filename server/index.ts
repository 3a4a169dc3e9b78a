/**
 * Tessera's process entry: one HTTP server on one port; Next.js renders pages and API
 * routes, socket.io serves /robot and /ops beside it.
 */
import nextEnv from "@next/env";

// Env files first: the modules below read configuration lazily, after this has run.
nextEnv.loadEnvConfig(process.cwd(), process.env.NODE_ENV !== "production");

const { startTessera } = await import("./main");
await startTessera();
