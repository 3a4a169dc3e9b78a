/** Structured logs: pretty lines in development, JSON lines in production. */
import pino from "pino";
import { runtimeEnv } from "./config";

const globalForLogger = globalThis as unknown as { __tesseraLogger?: pino.Logger };

function build(): pino.Logger {
  const env = runtimeEnv();
  const pretty = env.NODE_ENV !== "production" && process.stdout.isTTY;
  return pino({
    level: env.LOG_LEVEL,
    base: { app: "tessera" },
    transport: pretty ? { target: "pino-pretty", options: { colorize: true, translateTime: "HH:MM:ss.l" } } : undefined,
  });
}

/** The process-wide logger, shared with route handlers through globalThis (they are bundled apart). */
export const logger: pino.Logger = globalForLogger.__tesseraLogger ?? (globalForLogger.__tesseraLogger = build());
