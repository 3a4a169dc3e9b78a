/**
 * `npm start`: private MariaDB, migrations, demo seed, production build when the sources
 * changed, then the server on http://127.0.0.1:3000 (PORT overrides).
 *
 * Two nodes on one machine (README, "Growing past one machine"): give both the same
 * REDIS_URL on loopback and different ports; the first starts a private Redis there when
 * none answers and owns it and the private MariaDB (stop it last); the second, started once
 * the first is up, runs no simulators of its own and its mail catcher on another port:
 *
 *   REDIS_URL=redis://127.0.0.1:6379 npm start
 *   REDIS_URL=redis://127.0.0.1:6379 PORT=3001 MAIL_CATCHER_PORT=2526 TESSERA_DEMO_FLEET=off npm start
 */
import { execFileSync, spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { DEMO_USERS } from "../db/seed";
import { DATA_DIR, keptSecret, prepareDatabase, ROOT } from "./local-env";
import { startLocalRedis, type LocalRedis } from "./local-redis";

const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "127.0.0.1";
const demoPassword = process.env.DEMO_PASSWORD ?? "demo-tessera";
const publicUrl = process.env.NEXTAUTH_URL ?? `http://${host}:${port}`;

function sourceStamp(): string {
  const git = (args: string[]) => {
    try {
      return execFileSync("git", args, { cwd: ROOT, encoding: "utf8" });
    } catch {
      return String(Date.now());
    }
  };
  return createHash("sha256").update(git(["rev-parse", "HEAD"])).update(git(["status", "--porcelain"])).digest("hex");
}

function buildIfStale(): void {
  const stampFile = path.join(ROOT, ".next", "tessera-build-stamp");
  const stamp = sourceStamp();
  if (existsSync(path.join(ROOT, ".next", "BUILD_ID")) && existsSync(stampFile) && readFileSync(stampFile, "utf8") === stamp) {
    console.log("tessera: production build is up to date");
    return;
  }
  console.log("tessera: building the app (next build)");
  execFileSync("npx", ["next", "build"], { cwd: ROOT, stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } });
  writeFileSync(stampFile, stamp);
}

const secret = process.env.NEXTAUTH_SECRET ?? keptSecret("auth-secret");
const db = await prepareDatabase({
  instance: "mariadb",
  port: Number(process.env.TESSERA_DB_PORT ?? 3407),
  database: "tessera",
  // The demo operator is on call, so alert e-mails show on the Sent mail page from the start.
  seed: { demoPassword, fleetFile: path.join(DATA_DIR, "demo-fleet.json"), onCall: ["operator@tessera.test"] },
});
buildIfStale();

/** A private Redis when REDIS_URL names a loopback port where nothing answers yet. */
async function localRedis(): Promise<LocalRedis | undefined> {
  const raw = process.env.REDIS_URL;
  if (!raw) return undefined;
  const url = new URL(raw);
  if (!["127.0.0.1", "localhost"].includes(url.hostname) || url.password) return undefined;
  return startLocalRedis({ dir: path.join(DATA_DIR, "redis"), port: Number(url.port || 6379), log: (line) => console.log(`tessera: ${line}`) });
}
const redis = await localRedis();
// A node that found Redis already running is a second node: the first one's services stay up when it stops.
const ownsServices = !redis || redis.started;

const server = spawn(process.execPath, ["--import", "tsx", "server/index.ts"], {
  cwd: ROOT,
  stdio: "inherit",
  env: {
    ...process.env,
    NODE_ENV: "production",
    PORT: String(port),
    HOST: host,
    DATABASE_URL: db.url,
    NEXTAUTH_SECRET: secret,
    NEXTAUTH_URL: publicUrl,
    DEMO_PASSWORD: demoPassword,
    TESSERA_DEMO_ERRANDS: process.env.TESSERA_DEMO_ERRANDS ?? "on",
  },
});

let simulators: ReturnType<typeof spawn> | undefined;

/** The demo fleet: simulated robots that connect over /robot exactly as hardware would. */
function startDemoFleet(): void {
  if (process.env.TESSERA_DEMO_FLEET === "off") return;
  simulators = spawn(
    process.execPath,
    ["--import", "tsx", "simulators/cli.ts", "--url", `http://${host}:${port}`, "--fleet", path.join(DATA_DIR, "demo-fleet.json"), "--floorplan", "demo"],
    { cwd: ROOT, stdio: ["pipe", "inherit", "inherit"] },
  );
  process.stdin.pipe(simulators.stdin!);
}

async function waitForHealth(): Promise<boolean> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(`http://${host}:${port}/api/health`);
      if (res.ok) return true;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return false;
}

let stopping = false;
async function stop(code: number): Promise<void> {
  if (stopping) return;
  stopping = true;
  if (simulators && simulators.exitCode === null) {
    simulators.kill("SIGTERM");
    await new Promise((resolve) => simulators!.once("exit", resolve));
  }
  if (server.exitCode === null) {
    server.kill("SIGTERM");
    await new Promise((resolve) => server.once("exit", resolve));
  }
  if (redis?.started) {
    console.log("tessera: stopping Redis (nodes still using it lose their robots after the lease time)");
    await redis.stop();
  }
  if (db.local && ownsServices) {
    console.log("tessera: stopping MariaDB");
    await db.local.stop();
  }
  process.exit(code);
}
process.on("SIGINT", () => void stop(0));
process.on("SIGTERM", () => void stop(0));
server.on("exit", (code) => void stop(code ?? 1));

if (await waitForHealth()) {
  startDemoFleet();
  const accounts = DEMO_USERS.map((u) => `    ${u.role.padEnd(9)} ${u.email}`).join("\n");
  console.log(
    `\nTessera is up at ${publicUrl}\n  Demo accounts (password "${demoPassword}"):\n${accounts}\n` +
      "  Moving robots can hurt people: keep people clear of robot paths and a physical emergency stop within reach.\n" +
      "  Four simulated robots run the demo; type `help` here for fault injection (kidnap, stall, drop, drain).\n" +
      (process.env.SMTP_HOST
        ? `  Mail goes out through ${process.env.SMTP_HOST}.\n`
        : "  Mail (invites, resets) is caught on loopback, not delivered: admins read it under Sent mail (/mail).\n") +
      (process.env.REDIS_URL
        ? `  This node shares the fleet through ${process.env.REDIS_URL}; another node on this machine:\n` +
          `    REDIS_URL=${process.env.REDIS_URL} PORT=${port + 1} MAIL_CATCHER_PORT=${Number(process.env.MAIL_CATCHER_PORT ?? 2525) + 1} TESSERA_DEMO_FLEET=off npm start\n`
        : "") +
      "  Press Ctrl+C to stop.\n",
  );
} else {
  console.error("tessera: the server did not report healthy within 60 s");
  await stop(1);
}
