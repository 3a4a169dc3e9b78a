/**
 * The load run shared by `npm run load` and its short regression test: already registered
 * robots each send `beat` and `sensed` in turn at a fixed rate over the real robot link
 * (robots/link-client), a few dashboards watch their floorplan on /ops, and afterwards the
 * events table is checked for every acknowledged message.
 *
 * Figures, all taken in this process with one monotonic clock:
 * - acknowledgement latency: from the robot handing a message to its link client to the
 *   client receiving the server's ack (so a queue behind a slow ack counts against it);
 * - dashboard frame latency: each beat carries a battery value unique among that robot's
 *   recent beats; for each beat and each dashboard, the time from the robot handing the
 *   beat to its link client to that dashboard receiving the first `robot` frame of that
 *   robot showing that battery value;
 * - sustained rate: acknowledged messages divided by the time from the first send to the
 *   last acknowledgement.
 */
import { loadavg } from "node:os";
import { monitorEventLoopDelay, performance } from "node:perf_hooks";
import { and, count, eq, inArray, isNotNull } from "drizzle-orm";
// @ts-expect-error jstat ships no type declarations
import jstatModule from "jstat";
import { io, type Socket } from "socket.io-client";
import type { Db } from "../../db/client";
import { latestVersion, planFromVersion } from "../../db/queries/floorplans";
import { events } from "../../db/schema";
import { isFreeTile, type Floorplan } from "../../lib/floorplan";
import { OPS_EVENTS, type RobotFrame } from "../../lib/protocol";
import type { SensorSpec } from "../../lib/sensing";
import { createRobotClient, type RobotClient } from "../../robots/link-client";
import { createRng } from "../../simulators/rng";
import { createSimState, samplePlantParams } from "../../simulators/robot-physics";
import { defaultSensorParams, readSensors } from "../../simulators/sim-sensors";
import { sampleProcess, type ProcessSample } from "./proc";

const jStat = (jstatModule as { jStat: { percentile(values: number[], k: number): number } }).jStat;

/** The largest load a run may ask for: the script is for this machine's loopback, not a stress tool. */
export const LOAD_LIMITS = { robots: 200, ratePerRobot: 20, durationMs: 10 * 60_000, dashboards: 10 } as const;

export interface LoadOptions {
  /** The server's origin, e.g. http://127.0.0.1:3000; dashboards connect here. */
  url: string;
  /** Where the robots connect, taken in turn (several nodes); default `url`. */
  robotUrls?: string[];
  /** The server's database, read once at the start (floorplan) and at the end (the nothing-lost check). */
  db: Db;
  robots: { id: string; key: string }[];
  sensors: SensorSpec[];
  floorplanId: number;
  /** Messages per second each robot sends. */
  ratePerRobot: number;
  durationMs: number;
  /** Cookie headers of signed-in users, one /ops dashboard each. */
  dashboardCookies: string[];
  /** The Origin header dashboards send (the server checks it when present). */
  origin?: string;
  /** Processes to sample (the server, its database), by label. */
  sample?: Record<string, number>;
  /** How long to wait for outstanding acknowledgements after the last send (default 10 s). */
  drainMs?: number;
  seed?: number;
  log?: (line: string) => void;
}

export interface Percentiles {
  count: number;
  p50: number;
  p95: number;
  p99: number;
  max: number;
}

export interface ProcessFigures {
  cpuMeanPercent: number;
  cpuMaxPercent: number;
  /** Mean share of the run its main thread waited for a free core (other work on the machine). */
  waitMeanPercent: number;
  rssStartBytes: number;
  rssEndBytes: number;
  rssMaxBytes: number;
  samples: ProcessSample[];
}

export interface LoadReport {
  robots: number;
  ratePerRobot: number;
  durationS: number;
  dashboards: number;
  sent: number;
  acked: number;
  dup: number;
  refused: Record<string, number>;
  /** Sends that never got an acknowledgement (link stopped, or still waiting after the drain). */
  unacknowledged: number;
  sustainedPerS: number;
  ackMs: Percentiles;
  frameMs: Percentiles;
  /** Wall-clock seconds (ISO, to the second) in which most acknowledgements over 100 ms arrived, with their counts: stalls of the whole server show as a few crowded seconds. */
  slowSeconds: [string, number][];
  /** Beat frames some dashboard never received. */
  framesMissed: number;
  beliefFrames: number;
  processes: Record<string, ProcessFigures>;
  /** This process's event-loop delay over the run: a busy load process inflates every latency it measures. */
  loopDelayMs: { p99: number; max: number };
  /** The machine's 1-minute load average at the start and the end (other work on the machine skews the figures). */
  loadAverage: { start: number; end: number };
  stored: { checked: number; missing: number; duplicated: number };
  /** No refusal, every send acknowledged, and every acknowledged seq stored exactly once. */
  nothingLost: boolean;
}

export function percentiles(values: number[]): Percentiles {
  if (values.length === 0) return { count: 0, p50: NaN, p95: NaN, p99: NaN, max: NaN };
  return {
    count: values.length,
    p50: jStat.percentile(values, 0.5),
    p95: jStat.percentile(values, 0.95),
    p99: jStat.percentile(values, 0.99),
    max: values.reduce((a, b) => Math.max(a, b), -Infinity),
  };
}

/** Start tiles spread over the plan's free tiles, one per robot (several robots share a tile when the plan is small). */
function startTiles(plan: Floorplan, n: number): { row: number; col: number }[] {
  const free: { row: number; col: number }[] = [];
  for (let row = 0; row < plan.rows; row++) for (let col = 0; col < plan.cols; col++) if (isFreeTile(plan, row, col)) free.push({ row, col });
  if (free.length === 0) throw new Error("the floorplan has no free tile to place load robots on");
  return Array.from({ length: n }, (_, i) => free[Math.floor((i * free.length) / n)]);
}

function figures(samples: ProcessSample[]): ProcessFigures {
  const cpu = samples.map((s) => s.cpuPercent);
  const rss = samples.map((s) => s.rssBytes);
  const mean = (values: number[]) => (values.length ? values.reduce((a, b) => a + b, 0) / values.length : NaN);
  return {
    cpuMeanPercent: mean(cpu),
    waitMeanPercent: mean(samples.map((s) => s.waitPercent)),
    cpuMaxPercent: cpu.length ? Math.max(...cpu) : NaN,
    rssStartBytes: rss[0] ?? NaN,
    rssEndBytes: rss[rss.length - 1] ?? NaN,
    rssMaxBytes: rss.length ? Math.max(...rss) : NaN,
    samples,
  };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function until(check: () => boolean, timeoutMs: number): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) return false;
    await sleep(20);
  }
  return true;
}

async function openDashboard(url: string, cookie: string, origin: string | undefined, floorplanId: number): Promise<Socket> {
  const socket = io(`${url}/ops`, { transports: ["websocket"], reconnection: false, forceNew: true, extraHeaders: { cookie, ...(origin ? { origin } : {}) } });
  await new Promise<void>((resolve, reject) => {
    socket.once("connect", () => resolve());
    socket.once("connect_error", (err: Error & { data?: { code?: string } }) => reject(new Error(`dashboard sign-in refused: ${err.data?.code ?? err.message}`)));
  });
  const ack = (await socket.timeout(10_000).emitWithAck("watch", { floorplanId })) as { ok: boolean; error?: { code: string } };
  if (!ack.ok) throw new Error(`dashboard watch refused: ${ack.error?.code}`);
  return socket;
}

export async function runLoad(opts: LoadOptions): Promise<LoadReport> {
  const log = opts.log ?? (() => {});
  const n = opts.robots.length;
  if (n < 1 || n > LOAD_LIMITS.robots) throw new RangeError(`robots must be 1..${LOAD_LIMITS.robots}`);
  if (!(opts.ratePerRobot > 0 && opts.ratePerRobot <= LOAD_LIMITS.ratePerRobot)) throw new RangeError(`rate must be in (0, ${LOAD_LIMITS.ratePerRobot}] messages/s`);
  if (!(opts.durationMs > 0 && opts.durationMs <= LOAD_LIMITS.durationMs)) throw new RangeError(`duration must be in (0, ${LOAD_LIMITS.durationMs / 60_000}] minutes`);
  if (opts.dashboardCookies.length > LOAD_LIMITS.dashboards) throw new RangeError(`at most ${LOAD_LIMITS.dashboards} dashboards`);

  const version = await latestVersion(opts.db, opts.floorplanId);
  if (!version) throw new Error(`floorplan ${opts.floorplanId} has no version`);
  const plan = planFromVersion(version);
  const tiles = startTiles(plan, n);
  const sensorParams = defaultSensorParams();
  const seed = opts.seed ?? 20261202;

  const ackMs: number[] = [];
  const frameMs: number[] = [];
  const refused: Record<string, number> = {};
  const ackedSeqs = new Map<string, number[]>();
  const slow = new Map<string, number>();
  let sent = 0;
  let acked = 0;
  let dup = 0;
  let settled = 0;
  let firstSendAt = Infinity;
  let lastAckAt = 0;
  let beliefFrames = 0;
  // Per robot: battery value of a beat → when it was handed over, and how many dashboards have shown it.
  const beatsInFlight = new Map<string, Map<number, { at: number; seen: number }>>();
  let framesMissed = 0;

  const dashboards: Socket[] = [];
  const clients: RobotClient[] = [];
  const starters: (() => void)[] = [];
  const timers: NodeJS.Timeout[] = [];
  const samplers = Object.entries(opts.sample ?? {}).map(([label, pid]) => ({ label, sampler: sampleProcess(pid) }));
  const loop = monitorEventLoopDelay({ resolution: 10 });
  const loadStart = loadavg()[0];

  try {
    for (const cookie of opts.dashboardCookies) dashboards.push(await openDashboard(opts.url, cookie, opts.origin, opts.floorplanId));
    dashboards.forEach((socket) => {
      const shown = new Map<string, number>();
      socket.on(OPS_EVENTS.robot, (frame: RobotFrame) => {
        const beats = beatsInFlight.get(frame.robotId);
        if (!beats || frame.battery === null || shown.get(frame.robotId) === frame.battery) return;
        shown.set(frame.robotId, frame.battery);
        const beat = beats.get(frame.battery);
        if (!beat) return;
        frameMs.push(performance.now() - beat.at);
        beat.seen += 1;
        if (beat.seen === dashboards.length) beats.delete(frame.battery);
      });
      socket.on(OPS_EVENTS.belief, () => {
        beliefFrames += 1;
      });
    });

    const online = new Set<string>();
    opts.robots.forEach((robot, i) => {
      const rng = createRng(seed + i);
      const state = createSimState(plan, samplePlantParams("differential", plan.tileM, rng), { ...tiles[i], heading: 0 });
      const beats = new Map<number, { at: number; seen: number }>();
      beatsInFlight.set(robot.id, beats);
      ackedSeqs.set(robot.id, []);
      let battery = 0;
      const client = createRobotClient({
        url: opts.robotUrls?.length ? opts.robotUrls[i % opts.robotUrls.length] : opts.url,
        robotId: robot.id,
        key: robot.key,
        hello: { model: "tessera-load", drive: "differential", sensors: opts.sensors },
        // The run's own beats keep the link alive; the client's timer would only add unmeasured ones.
        beatIntervalMs: 3_600_000,
        status: () => ({ battery, status: "ok" }),
        onHello: () => online.add(robot.id),
      });
      clients.push(client);
      let tick = 0;
      const send = () => {
        const at = performance.now();
        firstSendAt = Math.min(firstSendAt, at);
        sent += 1;
        let pending;
        if (tick++ % 2 === 0) {
          // 1..999 thousandths: unique among the last 999 beats of this robot.
          battery = ((Math.round(battery * 1000) % 999) + 1) / 1000;
          if (dashboards.length) {
            if (beats.has(battery)) framesMissed += dashboards.length - beats.get(battery)!.seen;
            beats.set(battery, { at, seen: 0 });
          }
          pending = client.send("beat", { battery, status: "ok" });
        } else {
          pending = client.send("sensed", { readings: readSensors(state, opts.sensors, sensorParams, rng) });
        }
        pending.then(
          (ack) => {
            const now = performance.now();
            settled += 1;
            lastAckAt = now;
            ackMs.push(now - at);
            if (now - at > 100) {
              const second = new Date().toISOString().slice(0, 19);
              slow.set(second, (slow.get(second) ?? 0) + 1);
            }
            if (ack.ok) {
              acked += 1;
              if (ack.dup) dup += 1;
              ackedSeqs.get(robot.id)!.push(ack.seq);
            } else refused[ack.code] = (refused[ack.code] ?? 0) + 1;
          },
          () => {
            settled += 1;
          },
        );
      };
      starters.push(() => {
        const period = 1000 / opts.ratePerRobot;
        // Spread the robots' phases over one period so the server sees a steady stream, not bursts.
        const offset = (i * period) / n;
        const first = setTimeout(() => {
          send();
          timers.push(setInterval(send, period));
        }, offset);
        timers.push(first);
      });
    });
    if (!(await until(() => online.size === n, 20_000))) throw new Error(`only ${online.size} of ${n} load robots signed in within 20 s`);
    log(`load: ${n} robots online, ${dashboards.length} dashboards watching; sending ${opts.ratePerRobot} messages/s each for ${(opts.durationMs / 1000).toFixed(0)} s`);

    const started = performance.now();
    loop.enable();
    for (const start of starters) start();
    const progress = setInterval(() => log(`load: ${((performance.now() - started) / 1000).toFixed(0)} s, ${acked} acknowledged, ${sent - settled} waiting`), 10_000);
    await sleep(opts.durationMs);
    for (const t of timers) clearInterval(t);
    clearInterval(progress);
    loop.disable();
    await until(() => settled === sent, opts.drainMs ?? 10_000);
    // Frames of the last beats may still be on their way to the dashboards.
    await until(() => [...beatsInFlight.values()].every((m) => m.size === 0), 2000);
  } finally {
    for (const t of timers) clearInterval(t);
    for (const client of clients) client.close();
    for (const socket of dashboards) socket.close();
  }
  for (const beats of beatsInFlight.values()) for (const beat of beats.values()) framesMissed += dashboards.length - beat.seen;
  const processes = Object.fromEntries(samplers.map(({ label, sampler }) => [label, figures(sampler.stop())]));

  const stored = await checkStored(opts.db, ackedSeqs);
  const unacknowledged = sent - acked - Object.values(refused).reduce((a, b) => a + b, 0);
  return {
    robots: n,
    ratePerRobot: opts.ratePerRobot,
    durationS: opts.durationMs / 1000,
    dashboards: dashboards.length,
    sent,
    acked,
    dup,
    refused,
    unacknowledged,
    sustainedPerS: acked / ((lastAckAt - firstSendAt) / 1000),
    slowSeconds: [...slow].sort((a, b) => b[1] - a[1]).slice(0, 8),
    ackMs: percentiles(ackMs),
    frameMs: percentiles(frameMs),
    framesMissed,
    beliefFrames,
    processes,
    loopDelayMs: { p99: loop.percentile(99) / 1e6, max: loop.max / 1e6 },
    loadAverage: { start: loadStart, end: loadavg()[0] },
    stored,
    nothingLost: Object.keys(refused).length === 0 && unacknowledged === 0 && stored.missing === 0 && stored.duplicated === 0,
  };
}

/** Every acknowledged seq must be in the events table exactly once for its robot. */
async function checkStored(db: Db, ackedSeqs: Map<string, number[]>): Promise<LoadReport["stored"]> {
  const ids = [...ackedSeqs.keys()];
  const rows = await db
    .select({ robotId: events.robotId, seq: events.seq, n: count() })
    .from(events)
    .where(and(inArray(events.robotId, ids), eq(events.source, "robot"), isNotNull(events.seq)))
    .groupBy(events.robotId, events.seq);
  const found = new Map(rows.map((r) => [`${r.robotId}:${r.seq}`, r.n]));
  let checked = 0;
  let missing = 0;
  let duplicated = 0;
  for (const [robotId, seqs] of ackedSeqs) {
    for (const seq of new Set(seqs)) {
      checked += 1;
      const times = found.get(`${robotId}:${seq}`) ?? 0;
      if (times === 0) missing += 1;
      else if (times > 1) duplicated += 1;
    }
  }
  return { checked, missing, duplicated };
}

const mb = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(0)} MB`;
const ms = (p: Percentiles) => (p.count ? `p50 ${p.p50.toFixed(1)} ms, p95 ${p.p95.toFixed(1)} ms, p99 ${p.p99.toFixed(1)} ms, max ${p.max.toFixed(1)} ms (${p.count})` : "none measured");

/** The report as the load script prints it. */
export function formatReport(r: LoadReport): string {
  const lines = [
    `robots ${r.robots} × ${r.ratePerRobot} messages/s for ${r.durationS} s, ${r.dashboards} dashboards`,
    `sent ${r.sent}, acknowledged ${r.acked} (${r.dup} as duplicates), refused ${JSON.stringify(r.refused)}, unacknowledged ${r.unacknowledged}`,
    `sustained ${r.sustainedPerS.toFixed(1)} messages/s (asked ${r.robots * r.ratePerRobot})`,
    `acknowledgement latency: ${ms(r.ackMs)}`,
    `acknowledgements over 100 ms by second (busiest first): ${r.slowSeconds.map(([s, n]) => `${s.slice(11)} ${n}`).join(", ") || "none"}`,
    `dashboard frame latency: ${ms(r.frameMs)}; beat frames missed ${r.framesMissed}; belief frames received ${r.beliefFrames}`,
  ];
  for (const [label, p] of Object.entries(r.processes)) {
    lines.push(
      `${label}: CPU mean ${p.cpuMeanPercent.toFixed(0)} %, max ${p.cpuMaxPercent.toFixed(0)} % of one core; waited for a core ${p.waitMeanPercent.toFixed(0)} % of the time; RSS start ${mb(p.rssStartBytes)}, end ${mb(p.rssEndBytes)}, max ${mb(p.rssMaxBytes)} (${p.samples.length} samples)`,
    );
  }
  lines.push(`load process event-loop delay: p99 ${r.loopDelayMs.p99.toFixed(1)} ms, max ${r.loopDelayMs.max.toFixed(1)} ms; machine load average ${r.loadAverage.start.toFixed(2)} at the start, ${r.loadAverage.end.toFixed(2)} at the end`);
  lines.push(
    `nothing lost: ${r.nothingLost ? "yes" : "NO"} — ${r.stored.checked} acknowledged seqs checked, ${r.stored.missing} missing from the events table, ${r.stored.duplicated} stored twice`,
  );
  return lines.join("\n");
}
