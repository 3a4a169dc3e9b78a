/**
 * The one module that reads process.env. Parsed once, lazily (ESM imports are hoisted,
 * so reading at import time would run before the custom server loads .env files).
 */
import { z } from "zod";

const NodeEnv = z.enum(["development", "production", "test"]).default("development");
const LogLevel = z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info");

const required = (what: string) => ({ error: (issue: { input: unknown }) => (issue.input === undefined ? `is not set; ${what}` : `must be ${what}`) });

/** Production signs sessions for real users: a secret as long as `npm start` generates, not a short typed one. */
const PRODUCTION_SECRET_CHARS = 32;

const ConfigSchema = z
  .object({
    NODE_ENV: NodeEnv,
    HOST: z.string().default("127.0.0.1"),
    PORT: z.coerce.number().int().min(1).max(65535).default(3000),
    DATABASE_URL: z.string(required("set it to the mysql:// URL of the database")).url({ message: "must be a mysql:// URL" }),
    NEXTAUTH_SECRET: z.string(required("set it to a random string of at least 16 characters")).min(16, "must be at least 16 characters"),
    NEXTAUTH_URL: z.string().url().optional(),
    LOG_LEVEL: LogLevel,
    DEMO_PASSWORD: z.string().min(8).default("demo-tessera"),
    /** "off" serves only the robot link, the /ops feed and /api/health: a node that drives robots without rendering pages. */
    TESSERA_PAGES: z.enum(["on", "off"]).default("on"),
    /**
     * "true" when Tessera sits behind a reverse proxy of its own that appends the client's
     * address to X-Forwarded-For; otherwise that header is the client's to forge and is ignored.
     */
    TRUSTED_PROXY: z
      .enum(["true", "false"], { message: 'must be "true" or "false"' })
      .default("false")
      .transform((v) => v === "true"),
  })
  .superRefine((c, ctx) => {
    if (c.NODE_ENV === "production" && c.NEXTAUTH_SECRET.length < PRODUCTION_SECRET_CHARS) {
      ctx.addIssue({ code: "custom", path: ["NEXTAUTH_SECRET"], message: `must be at least ${PRODUCTION_SECRET_CHARS} characters in production` });
    }
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

const RuntimeSchema = z.object({ NODE_ENV: NodeEnv, LOG_LEVEL: LogLevel });

/** The settings that logging needs, readable before the secrets are in place. */
export function runtimeEnv(): z.infer<typeof RuntimeSchema> {
  return RuntimeSchema.parse(process.env);
}

/** The public origin dashboards are served from, used to check websocket Origin headers. */
export function publicUrl(): string {
  const c = config();
  return c.NEXTAUTH_URL ?? `http://${c.HOST}:${c.PORT}`;
}

const FleetConfigSchema = z.object({
  /** Robot silence after which it is offline and its mission held, ms. */
  heartbeatTimeoutMs: z.coerce.number().int().min(500).default(3000),
  /** Certainty (mass on the most likely tile) under which a robot counts as unsure. */
  holdBelow: z.coerce.number().min(0).max(1).default(0.3),
  /** Consecutive unsure steps before an automatic hold. */
  holdAfterSteps: z.coerce.number().int().min(1).default(3),
  /** Certainty needed to end an automatic hold; above holdBelow (hysteresis). */
  releaseAbove: z.coerce.number().min(0).max(1).default(0.55),
  /** Belief mass on the goal tile that counts as arrival. */
  arriveMass: z.coerce.number().min(0).max(1).default(0.8),
  /** Tile mass at which another robot is taken to stand on its most likely tile. */
  trafficMass: z.coerce.number().min(0).max(1).default(0.4),
  /** A traffic wait this long re-plans around the blocking robot, ms. */
  trafficReplanMs: z.coerce.number().int().min(0).default(6000),
  /** Consecutive moves the robot's odometry says did not happen (bumped, blocked) before it is held with reason fault. */
  stuckAfterMoves: z.coerce.number().int().min(1).default(3),
  /** A sent step with no `moved` for this long is sent once more; after a second such wait the robot is held with reason fault, ms. */
  stepTimeoutMs: z.coerce.number().int().min(1000).default(20_000),
  /** Steps after which a mission that has not arrived fails. */
  maxMissionSteps: z.coerce.number().int().min(1).default(400),
  /** Fused steps between belief snapshots. */
  snapshotEvery: z.coerce.number().int().min(1).default(20),
  /** Longest wait before a batch of writes is committed, ms. */
  writeTickMs: z.coerce.number().int().min(1).default(15),
  /** Belief frames per second per robot to dashboards, at most. */
  beliefFrameHz: z.coerce.number().min(0.1).max(30).default(4),
  /** Plans with more tiles than this solve their policy in a worker thread. */
  workerTiles: z.coerce.number().int().min(0).default(2500),
  /** Refused messages within errorWindowMs that end a robot's connection (PROTOCOL.md: 20 in 10 s). */
  maxErrors: z.coerce.number().int().min(1).default(20),
  errorWindowMs: z.coerce.number().int().min(100).default(10_000),
  /** Replace an old connection when a robot connects twice (PROTOCOL.md default); false refuses the new one. */
  replaceConnections: z
    .enum(["true", "false"])
    .default("true")
    .transform((v) => v === "true"),
});

export type FleetConfig = z.infer<typeof FleetConfigSchema>;

const FLEET_ENV: Record<keyof FleetConfig, string> = {
  heartbeatTimeoutMs: "HEARTBEAT_TIMEOUT_MS",
  holdBelow: "FLEET_HOLD_BELOW",
  holdAfterSteps: "FLEET_HOLD_AFTER_STEPS",
  releaseAbove: "FLEET_RELEASE_ABOVE",
  arriveMass: "FLEET_ARRIVE_MASS",
  trafficMass: "FLEET_TRAFFIC_MASS",
  trafficReplanMs: "FLEET_TRAFFIC_REPLAN_MS",
  stuckAfterMoves: "FLEET_STUCK_AFTER_MOVES",
  stepTimeoutMs: "FLEET_STEP_TIMEOUT_MS",
  maxMissionSteps: "FLEET_MAX_MISSION_STEPS",
  snapshotEvery: "FLEET_SNAPSHOT_EVERY",
  writeTickMs: "FLEET_WRITE_TICK_MS",
  beliefFrameHz: "FLEET_BELIEF_FRAME_HZ",
  workerTiles: "FLEET_WORKER_TILES",
  maxErrors: "FLEET_MAX_ERRORS",
  errorWindowMs: "FLEET_ERROR_WINDOW_MS",
  replaceConnections: "FLEET_REPLACE_CONNECTIONS",
};

/** Fleet thresholds and timings: defaults, each overridable by its environment variable. */
export function fleetConfig(overrides: Partial<FleetConfig> = {}): FleetConfig {
  const raw: Record<string, unknown> = {};
  for (const [key, name] of Object.entries(FLEET_ENV)) if (process.env[name] !== undefined) raw[key] = process.env[name];
  const parsed = FleetConfigSchema.safeParse(raw);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${FLEET_ENV[issue.path[0] as keyof FleetConfig]}: ${issue.message}`);
    throw new Error(`Tessera cannot start; fix these fleet settings:\n${lines.join("\n")}`);
  }
  return { ...parsed.data, ...overrides };
}

const MailConfigSchema = z.object({
  /** A real provider's SMTP host; unset means Tessera's own catcher on loopback (npm start, tests). */
  SMTP_HOST: z.string().min(1).optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(587),
  SMTP_USER: z.string().min(1).optional(),
  SMTP_PASSWORD: z.string().min(1).optional(),
  MAIL_FROM: z.string().min(3).default("Tessera <tessera@localhost>"),
  /** Port of the loopback SMTP catcher that the server runs when SMTP_HOST is unset. */
  MAIL_CATCHER_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
});

export type MailConfig = z.infer<typeof MailConfigSchema>;

/** Outgoing mail settings; an empty variable counts as unset. */
export function mailConfig(): MailConfig {
  const raw = Object.fromEntries(Object.keys(MailConfigSchema.shape).flatMap((name) => (process.env[name] ? [[name, process.env[name]]] : [])));
  const parsed = MailConfigSchema.safeParse(raw);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Tessera cannot send mail; fix these environment variables:\n${lines.join("\n")}`);
  }
  return parsed.data;
}

/** Whether the demo scheduler sends idle simulated robots on errands; `npm start` turns it on unless TESSERA_DEMO_ERRANDS=off. */
export function demoErrandsEnabled(): boolean {
  return process.env.TESSERA_DEMO_ERRANDS === "on";
}

const ReportsConfigSchema = z.object({
  /** Local wall-clock time at which each shift ends and its digest goes out; unset sends none. */
  TESSERA_SHIFT_END: z
    .string()
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, "must be a local time as HH:MM, 00:00 to 23:59")
    .optional(),
});

/** The end-of-shift digest's schedule. */
export function reportsConfig(): { shiftEnd: string | null } {
  const parsed = ReportsConfigSchema.safeParse(process.env);
  if (!parsed.success) throw new Error(`Tessera cannot start; TESSERA_SHIFT_END ${parsed.error.issues[0].message}`);
  return { shiftEnd: parsed.data.TESSERA_SHIFT_END ?? null };
}

const WebhookConfigSchema = z
  .object({
    ALERT_WEBHOOK_URL: z.url({ protocol: /^https?$/, message: "must be an http(s) URL" }).optional(),
    ALERT_WEBHOOK_SECRET: z.string().min(16, "must be at least 16 characters").optional(),
    /** First retry delay; each later one doubles it. */
    ALERT_WEBHOOK_BASE_DELAY_MS: z.coerce.number().int().min(1).default(1000),
    ALERT_WEBHOOK_TRIES: z.coerce.number().int().min(1).max(10).default(5),
  })
  .refine((c) => (c.ALERT_WEBHOOK_URL === undefined) === (c.ALERT_WEBHOOK_SECRET === undefined), {
    message: "ALERT_WEBHOOK_URL and ALERT_WEBHOOK_SECRET are set together or not at all",
    path: ["ALERT_WEBHOOK_SECRET"],
  });

export interface WebhookConfig {
  url: string;
  secret: string;
  baseDelayMs: number;
  tries: number;
}

/** The outgoing alert webhook, or null when no admin configured one. */
export function webhookConfig(): WebhookConfig | null {
  const parsed = WebhookConfigSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Tessera cannot start; fix the alert webhook settings:\n${lines.join("\n")}`);
  }
  const c = parsed.data;
  if (!c.ALERT_WEBHOOK_URL || !c.ALERT_WEBHOOK_SECRET) return null;
  return { url: c.ALERT_WEBHOOK_URL, secret: c.ALERT_WEBHOOK_SECRET, baseDelayMs: c.ALERT_WEBHOOK_BASE_DELAY_MS, tries: c.ALERT_WEBHOOK_TRIES };
}

const AlertMailConfigSchema = z.object({
  /** One alert e-mail per robot within this window; later alerts are counted into the next. */
  ALERT_MAIL_WINDOW_MS: z.coerce.number().int().min(0).default(10 * 60_000),
});

/** Alert e-mails' rate limit. */
export function alertMailConfig(): { windowMs: number } {
  const parsed = AlertMailConfigSchema.safeParse(process.env);
  if (!parsed.success) throw new Error(`Tessera cannot start; ALERT_MAIL_WINDOW_MS ${parsed.error.issues[0].message}`);
  return { windowMs: parsed.data.ALERT_MAIL_WINDOW_MS };
}

const ClusterConfigSchema = z
  .object({
    /** Redis shared by several Tessera nodes; unset runs one node alone, with no Redis at all. */
    REDIS_URL: z.url({ protocol: /^rediss?$/, message: "must be a redis:// URL" }).optional(),
    /** This node's name in leases and logs; defaults to host and port, unique on one machine. */
    TESSERA_NODE_ID: z.string().regex(/^[A-Za-z0-9._-]{1,60}$/, "must be 1 to 60 letters, digits, dots, dashes or underscores").optional(),
    /** How long a robot's lease outlives its node's last renewal, ms: the takeover time after a node dies. */
    TESSERA_LEASE_TTL_MS: z.coerce.number().int().min(500).default(5000),
    /** Lease renewal period, ms; well under the TTL so that one late renewal does not lose the robot. */
    TESSERA_LEASE_RENEW_MS: z.coerce.number().int().min(100).default(1500),
    /** How long a command or frame request waits for the other nodes, ms. */
    TESSERA_NODE_TIMEOUT_MS: z.coerce.number().int().min(100).default(2000),
  })
  .refine((c) => c.TESSERA_LEASE_RENEW_MS * 2 <= c.TESSERA_LEASE_TTL_MS, {
    message: "must be at most half of TESSERA_LEASE_TTL_MS",
    path: ["TESSERA_LEASE_RENEW_MS"],
  });

export interface ClusterConfig {
  redisUrl: string;
  nodeId: string;
  leaseTtlMs: number;
  leaseRenewMs: number;
  nodeTimeoutMs: number;
}

/** Settings for running as one of several nodes, or null when REDIS_URL is unset (one node alone). */
export function clusterConfig(): ClusterConfig | null {
  const raw = Object.fromEntries(Object.keys(ClusterConfigSchema.shape).flatMap((name) => (process.env[name] ? [[name, process.env[name]]] : [])));
  const parsed = ClusterConfigSchema.safeParse(raw);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Tessera cannot start; fix these node settings:\n${lines.join("\n")}`);
  }
  const c = parsed.data;
  if (!c.REDIS_URL) return null;
  const { HOST, PORT } = config();
  return {
    redisUrl: c.REDIS_URL,
    nodeId: c.TESSERA_NODE_ID ?? `${HOST}-${PORT}`.replace(/[^A-Za-z0-9._-]/g, "_"),
    leaseTtlMs: c.TESSERA_LEASE_TTL_MS,
    leaseRenewMs: c.TESSERA_LEASE_RENEW_MS,
    nodeTimeoutMs: c.TESSERA_NODE_TIMEOUT_MS,
  };
}
