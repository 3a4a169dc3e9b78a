/**
 * A private Redis on loopback for the multi-node tests and for trying two nodes on one
 * machine, so neither needs Redis set up by hand: Debian's redis-server, installed when
 * missing, run with its whole configuration on the command line (no /etc/redis file) and
 * nothing persisted, since leases and adapter traffic are worthless after a restart.
 */
import { spawn } from "node:child_process";
import { existsSync, mkdirSync, readFileSync } from "node:fs";
import { createConnection } from "node:net";
import path from "node:path";
import { ensureDebianBinary } from "../db/local-mariadb";

export interface LocalRedis {
  port: number;
  url: string;
  /** False when a Redis already answered on the port (another node's, or one of your own). */
  started: boolean;
  stop(): Promise<void>;
}

/** Installs Debian's redis-server when the binary is missing (needs root, as on CI). */
export function ensureRedisInstalled(log: (line: string) => void = () => {}): string {
  return ensureDebianBinary("redis-server", "redis-server", log);
}

/** Sends one inline command and resolves with the first reply line, or rejects when nothing listens. */
function command(port: number, line: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const socket = createConnection({ host: "127.0.0.1", port });
    socket.setTimeout(1000, () => socket.destroy(new Error("no answer")));
    socket.once("connect", () => socket.write(`${line}\r\n`));
    socket.once("data", (data) => {
      resolve(data.toString("utf8").split("\r\n")[0]);
      socket.end();
    });
    socket.once("error", reject);
    socket.once("close", () => reject(new Error("closed without a reply")));
  });
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Starts a Redis on 127.0.0.1:`port` with its files under `dir`, unless one answers there already. */
export async function startLocalRedis(opts: { dir: string; port: number; log?: (line: string) => void }): Promise<LocalRedis> {
  const log = opts.log ?? (() => {});
  const binary = ensureRedisInstalled(log);
  const dir = path.resolve(opts.dir);
  mkdirSync(dir, { recursive: true });
  const logFile = path.join(dir, "redis.log");
  const url = `redis://127.0.0.1:${opts.port}`;
  const ping = () => command(opts.port, "PING").then((reply) => reply === "+PONG", () => false);
  const started = !(await ping());
  if (started) {
    log(`starting Redis on 127.0.0.1:${opts.port}`);
    const child = spawn(
      binary,
      ["--port", String(opts.port), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--dir", dir, "--logfile", logFile, "--daemonize", "no"],
      { detached: true, stdio: "ignore" },
    );
    child.unref();
    const deadline = Date.now() + 15_000;
    while (!(await ping())) {
      if (child.exitCode !== null || Date.now() > deadline) {
        const tail = existsSync(logFile) ? readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n") : "(no log)";
        throw new Error(`Redis did not answer on port ${opts.port}; last lines of ${logFile}:\n${tail}`);
      }
      await sleep(100);
    }
  }
  return {
    port: opts.port,
    url,
    started,
    async stop() {
      // SHUTDOWN closes the connection without a reply; wait until the port is free.
      await command(opts.port, "SHUTDOWN NOSAVE").catch(() => "");
      const deadline = Date.now() + 10_000;
      while ((await ping()) && Date.now() < deadline) await sleep(100);
    },
  };
}
