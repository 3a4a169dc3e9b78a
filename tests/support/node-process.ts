/**
 * A Tessera server in its own process, for suites that kill it (SIGKILL), restart it or
 * run several of them: the real entry (server/index.ts) with pages off, so no Next build
 * is needed and start-up takes a second or two.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { ROOT } from "../../scripts/local-env";

export interface NodeProcess {
  url: string;
  port: number;
  child: ChildProcess;
  /** What the process wrote to stderr, for failure messages. */
  stderr(): string;
  /** Sends `signal` and waits for the process to exit. */
  kill(signal?: NodeJS.Signals): Promise<void>;
}

export interface NodeOptions {
  port: number;
  databaseUrl: string;
  /** More environment (fleet settings, REDIS_URL, …). */
  env?: Record<string, string>;
  healthTimeoutMs?: number;
}

export const NODE_SECRET = "tessera-node-suite-secret-not-for-production";

async function waitForHealth(url: string, child: ChildProcess, timeoutMs: number, stderr: () => string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`the server exited with code ${child.exitCode} before it was healthy:\n${stderr()}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`the server on ${url} did not report healthy within ${timeoutMs} ms:\n${stderr()}`);
}

export async function startNode(opts: NodeOptions): Promise<NodeProcess> {
  const url = `http://127.0.0.1:${opts.port}`;
  const child = spawn(process.execPath, ["--import", "tsx", "server/index.ts"], {
    cwd: ROOT,
    stdio: ["ignore", "ignore", "pipe"],
    env: {
      ...process.env,
      NODE_ENV: "production",
      TESSERA_PAGES: "off",
      PORT: String(opts.port),
      HOST: "127.0.0.1",
      DATABASE_URL: opts.databaseUrl,
      NEXTAUTH_SECRET: NODE_SECRET,
      NEXTAUTH_URL: url,
      LOG_LEVEL: process.env.TESSERA_NODE_LOG_LEVEL ?? "warn",
      SMTP_HOST: "smtp.invalid",
      TESSERA_DEMO_ERRANDS: "off",
      ...opts.env,
    },
  });
  let err = "";
  child.stderr?.setEncoding("utf8");
  child.stderr?.on("data", (chunk: string) => {
    err = (err + chunk).slice(-20_000);
  });
  const stderr = () => err;
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  await waitForHealth(url, child, opts.healthTimeoutMs ?? 30_000, stderr);
  return {
    url,
    port: opts.port,
    child,
    stderr,
    async kill(signal = "SIGTERM") {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
}
