/**
 * A process's CPU and memory as Linux reports them under /proc, and the process that
 * listens on a loopback TCP port (the load script's way to find the server it measures).
 */
import { execFileSync } from "node:child_process";
import { readdirSync, readFileSync, readlinkSync } from "node:fs";

/** The pid of the process listening on `port` (IPv4 or IPv6), or null when none of this user's processes does. */
export function pidListeningOn(port: number): number | null {
  const inodes = new Set<string>();
  const hexPort = port.toString(16).toUpperCase().padStart(4, "0");
  for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    let text: string;
    try {
      text = readFileSync(table, "utf8");
    } catch {
      continue;
    }
    for (const line of text.split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      // local_address is HEXIP:HEXPORT, st 0A is LISTEN, the inode is the tenth column.
      if (cols.length > 9 && cols[1].endsWith(`:${hexPort}`) && cols[3] === "0A") inodes.add(cols[9]);
    }
  }
  if (inodes.size === 0) return null;
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    let fds: string[];
    try {
      fds = readdirSync(`/proc/${entry}/fd`);
    } catch {
      // Another user's process: its descriptors are not ours to read.
      continue;
    }
    for (const fd of fds) {
      try {
        const target = readlinkSync(`/proc/${entry}/fd/${fd}`);
        const match = /^socket:\[(\d+)\]$/.exec(target);
        if (match && inodes.has(match[1])) return Number(entry);
      } catch {
        // The descriptor closed while we looked.
      }
    }
  }
  return null;
}

let ticksPerSecond: number | undefined;

function clockTicks(): number {
  if (ticksPerSecond === undefined) {
    try {
      ticksPerSecond = Number(execFileSync("getconf", ["CLK_TCK"], { encoding: "utf8" }).trim()) || 100;
    } catch {
      ticksPerSecond = 100;
    }
  }
  return ticksPerSecond;
}

/**
 * CPU seconds (user + system) a process has used so far, its resident set in bytes, and how
 * long its main thread (for Node, the event loop) has waited for a free core so far.
 */
export function readProcess(pid: number): { cpuS: number; rssBytes: number; runQueueS: number } {
  const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
  // The command name in parentheses may hold spaces; the fields after it are fixed.
  const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
  const cpuS = (Number(fields[11]) + Number(fields[12])) / clockTicks();
  const rss = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
  // schedstat: time on a core, time runnable but waiting for one (ns), timeslices.
  const runQueueS = Number(readFileSync(`/proc/${pid}/schedstat`, "utf8").split(" ")[1]) / 1e9;
  return { cpuS, rssBytes: rss ? Number(rss[1]) * 1024 : 0, runQueueS };
}

export interface ProcessSample {
  /** Milliseconds since the sampler started. */
  atMs: number;
  /** CPU use since the previous sample, percent of one core. */
  cpuPercent: number;
  /** Share of the interval the main thread was ready to run but waited for a core, percent. */
  waitPercent: number;
  rssBytes: number;
}

/** Samples a process once per `everyMs` until stopped; a process that exits ends the series. */
export function sampleProcess(pid: number, everyMs = 1000): { stop(): ProcessSample[] } {
  const samples: ProcessSample[] = [];
  const started = Date.now();
  let last = { at: started, ...readProcess(pid) };
  const timer = setInterval(() => {
    try {
      const now = Date.now();
      const read = readProcess(pid);
      const seconds = (now - last.at) / 1000;
      samples.push({
        atMs: now - started,
        cpuPercent: ((read.cpuS - last.cpuS) / seconds) * 100,
        waitPercent: ((read.runQueueS - last.runQueueS) / seconds) * 100,
        rssBytes: read.rssBytes,
      });
      last = { at: now, ...read };
    } catch {
      clearInterval(timer);
    }
  }, everyMs);
  return {
    stop() {
      clearInterval(timer);
      return samples;
    },
  };
}
