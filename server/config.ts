/**
 * The one module that reads process.env. Parsed once, lazily (ESM imports are hoisted,
 * so reading at import time would run before the custom server loads .env files).
 */
import { z } from "zod";

const ConfigSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  HOST: z.string().default("127.0.0.1"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  DATABASE_URL: z.string().url({ message: "DATABASE_URL must be a mysql:// URL" }),
  NEXTAUTH_SECRET: z.string().min(16, "NEXTAUTH_SECRET must be at least 16 characters"),
  NEXTAUTH_URL: z.string().url().optional(),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  DEMO_PASSWORD: z.string().min(8).default("demo-tessera"),
  HEARTBEAT_TIMEOUT_MS: z.coerce.number().int().min(500).default(3000),
});

export type Config = z.infer<typeof ConfigSchema>;

let cached: Config | undefined;

/** The parsed configuration; throws once, with every missing or malformed variable named. */
export function config(): Config {
  if (cached) return cached;
  const parsed = ConfigSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Tessera cannot start; fix these environment variables:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}

const RuntimeSchema = ConfigSchema.pick({ NODE_ENV: true, LOG_LEVEL: true });

/** The settings that logging needs, readable before the secrets are in place. */
export function runtimeEnv(): z.infer<typeof RuntimeSchema> {
  return RuntimeSchema.parse(process.env);
}

/** The public origin dashboards are served from, used to check websocket Origin headers. */
export function publicUrl(): string {
  const c = config();
  return c.NEXTAUTH_URL ?? `http://${c.HOST}:${c.PORT}`;
}
