/**
 * Browser tests run against a real production build served by the custom server, on its
 * own port and its own database.
 */
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import type { TestProject } from "vitest/node";
import { prepareDatabase, ROOT } from "../../scripts/local-env";

const APP_PORT = Number(process.env.TESSERA_E2E_PORT ?? 3517);
const DB_PORT = Number(process.env.TESSERA_E2E_DB_PORT ?? 3418);
/** The server's own SMTP catcher: invites and resets sent in browser tests land on /mail. */
const SMTP_PORT = Number(process.env.TESSERA_E2E_SMTP_PORT ?? 2517);

async function waitForHealth(url: string, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + 90_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`the server exited with code ${child.exitCode} before it was healthy`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error("the server did not report healthy within 90 s");
}

export default async function setup(project: TestProject) {
  const db = await prepareDatabase({ instance: "mariadb-e2e", port: DB_PORT, database: "tessera_e2e", fresh: true, seed: { demoPassword: "demo-tessera" } });
  if (!process.env.TESSERA_E2E_SKIP_BUILD) {
    execFileSync("npx", ["next", "build"], { cwd: ROOT, stdio: ["ignore", "ignore", "inherit"], env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } });
  }
  const appUrl = `http://127.0.0.1:${APP_PORT}`;
  const server = spawn(process.execPath, ["--import", "tsx", "server/index.ts"], {
    cwd: ROOT,
    stdio: ["ignore", "ignore", "inherit"],
    env: {
      ...process.env,
      NODE_ENV: "production",
      PORT: String(APP_PORT),
      HOST: "127.0.0.1",
      DATABASE_URL: db.url,
      NEXTAUTH_SECRET: "tessera-e2e-secret-not-for-production",
      NEXTAUTH_URL: appUrl,
      LOG_LEVEL: "warn",
      // Sign-in limit tests stand for distinct clients by the X-Forwarded-For they send, so
      // their failures never limit the loopback address every other test signs in from.
      TRUSTED_PROXY: "true",
      SMTP_HOST: "",
      MAIL_CATCHER_PORT: String(SMTP_PORT),
      // The live floor's load test streams belief frames at 5 Hz per robot.
      FLEET_BELIEF_FRAME_HZ: "5",
    },
  });
  await waitForHealth(appUrl, server);
  project.provide("appUrl", appUrl);
  project.provide("databaseUrl", db.url);
  return async () => {
    if (server.exitCode === null) {
      server.kill("SIGTERM");
      await new Promise((resolve) => server.once("exit", resolve));
    }
    await db.local?.stop();
  };
}
