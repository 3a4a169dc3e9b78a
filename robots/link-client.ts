/**
 * The robot side of Tessera's robot link, version 1 (PROTOCOL.md): signs in on the /robot
 * namespace, sends `hello` first after every (re)connect, heartbeats, and delivers every
 * other message exactly in the order it was sent, each under its own `seq`, until the server
 * acknowledges it.
 *
 * Delivery is one message in flight at a time. That costs a round trip per message but is
 * what keeps the server's "seq lower than one already applied" rule from ever refusing a
 * retried message: a message is only transmitted once everything before it is acknowledged.
 *
 * The hello of a reconnect keeps the previous hello's seq while messages are still waiting,
 * so that it stays below all of them (the server answers a hello even when its seq was seen
 * before). Messages that were never transmitted may be renumbered once the hello ack's
 * `lastSeq` shows that the robot's counter fell behind (a reboot that lost the counter);
 * a message that has been transmitted keeps its seq for ever, so the server's duplicate
 * check can recognise it.
 *
 * Heartbeats are only generated while signed in: a beat says "alive now", so beats from a
 * time without a link would be stale on arrival.
 */
import { readFileSync, renameSync, writeFileSync } from "node:fs";
import { io, type Socket } from "socket.io-client";
import {
  AckSchema,
  DoneSchema,
  HoldSchema,
  NextSchema,
  PROTOCOL_VERSION,
  ReleaseSchema,
  TuneSchema,
  SimFaultSchema,
  type Ack,
  type RobotEventName,
  type RobotMessage,
  type ServerMessage,
} from "../lib/protocol";
import type { Sensor } from "../lib/sensing";
import type { AckCode, Drive, HandshakeCode } from "../lib/vocabulary";

/** Where the robot keeps the last seq it has used; it must survive restarts for seq to keep rising. */
export interface SeqStore {
  /** The last seq used, 0 when none has been. */
  load(): number;
  save(seq: number): void;
}

/** A seq store in memory (lost with the process), starting after `initial`. */
export function memorySeqStore(initial = 0): SeqStore {
  let last = initial;
  return {
    load: () => last,
    save: (seq) => {
      last = seq;
    },
  };
}

/** A seq store in a small text file, written atomically (temporary file, then rename); a missing or unreadable file reads as 0. */
export function fileSeqStore(path: string): SeqStore {
  return {
    load() {
      try {
        const value = Number.parseInt(readFileSync(path, "utf8").trim(), 10);
        return Number.isSafeInteger(value) && value > 0 ? value : 0;
      } catch {
        return 0;
      }
    },
    save(seq) {
      const temporary = `${path}.tmp`;
      writeFileSync(temporary, `${seq}\n`);
      renameSync(temporary, path);
    },
  };
}

/** Link states: `refused` (handshake refused for good), `replaced` (another connection took over) and `closed` are final. */
export type LinkState = "connecting" | "online" | "offline" | "refused" | "replaced" | "closed";

/** What a beat reports: battery charge 0..1 and the robot's own health. */
export interface BeatStatus {
  battery: number;
  status: "ok" | "fault";
  fault?: string;
}

/** pino-compatible logging surface (fields first, then the message). */
export interface LinkLogger {
  info(fields: Record<string, unknown>, msg: string): void;
  warn(fields: Record<string, unknown>, msg: string): void;
}

export interface RobotClientOptions {
  /** The web app's origin, e.g. http://127.0.0.1:3000; the namespace /robot is appended. */
  url: string;
  robotId: string;
  key: string;
  hello: { model: string; drive: Drive; sensors: Sensor[] };
  seqStore?: SeqStore;
  /** Heartbeat period in milliseconds (default 1000, as PROTOCOL.md asks for at least one a second). */
  beatIntervalMs?: number;
  /** How long to wait for an acknowledgement before sending the same message again (default 5000 ms). */
  ackTimeoutMs?: number;
  /** First and largest wait between reconnection attempts (defaults 500 ms and 5000 ms). */
  reconnectDelayMs?: number;
  reconnectDelayMaxMs?: number;
  status?: () => BeatStatus;
  onNext?: (msg: ServerMessage["next"]) => void;
  onHold?: (msg: ServerMessage["hold"]) => void;
  onRelease?: (msg: ServerMessage["release"]) => void;
  onDone?: (msg: ServerMessage["done"]) => void;
  onTune?: (msg: ServerMessage["tune"]) => void;
  /** Simulated robots only: a fault an admin injects. */
  onFault?: (msg: ServerMessage["fault"]) => void;
  /** Every accepted hello ack (carries lastSeq, state and the active mission). */
  onHello?: (ack: Extract<Ack, { ok: true }>) => void;
  onState?: (state: LinkState, detail: { code?: string; reason?: string }) => void;
  /** Every acknowledgement as it arrives, the refusals this client retries included: for monitoring. */
  onAck?: (event: RobotEventName, seq: number, ack: Ack) => void;
  logger?: LinkLogger;
}

/** A message's payload as the caller gives it: the envelope (seq, at) is the client's. */
export type RobotPayload<E extends Exclude<RobotEventName, "hello">> = Omit<RobotMessage[E], "seq" | "at">;

/** Why a link stopped: closed by its owner, replaced by another connection, a refused handshake, or a refused hello. */
export type StopCode = "closed" | "replaced" | HandshakeCode | AckCode;

/** Why a send can never be acknowledged any more: the client was closed, refused or replaced. */
export class LinkStoppedError extends Error {
  constructor(readonly code: StopCode) {
    super(`robot link stopped: ${code}`);
    this.name = "LinkStoppedError";
  }
}

export interface RobotClient {
  /**
   * Queues a message under the next seq and resolves with the server's final ack: ok (possibly
   * dup), or a refusal other than internal/rate_limited (those are retried). Rejects with
   * LinkStoppedError only when the client is closed, refused or replaced before the ack.
   */
  send<E extends Exclude<RobotEventName, "hello">>(event: E, payload: RobotPayload<E>): Promise<Ack>;
  readonly state: LinkState;
  /** The code of the last refused handshake (bad_key, unknown_robot, retired, already_connected, …), or null. */
  readonly refusal: string | null;
  /** The last seq assigned. */
  readonly lastSeq: number;
  /** Messages waiting for an acknowledgement. */
  readonly pending: number;
  /** Cuts the link (as a dropped radio would) without losing queued messages; `resume` reconnects. */
  pause(): void;
  resume(): void;
  /** Ends the link for good; waiting sends reject with LinkStoppedError("closed"). */
  close(): void;
}

interface Outgoing {
  event: Exclude<RobotEventName, "hello">;
  message: { seq: number; at: number } & Record<string, unknown>;
  transmitted: boolean;
  resolve: (ack: Ack) => void;
  reject: (err: Error) => void;
}

const FINAL_HANDSHAKE_CODES = new Set<string>(["bad_key", "unknown_robot", "retired"]);
const RETRIED_ACK_CODES = new Set<AckCode>(["internal", "rate_limited"]);
const RETRY_DELAY_MS = 250;
const RETRY_DELAY_MAX_MS = 5000;
const HELLO_RESYNC_LIMIT = 3;

const silentLogger: LinkLogger = { info: () => {}, warn: () => {} };

/** Creates and connects a robot link client (socket.io 4 over websocket, namespace /robot). */
export function createRobotClient(opts: RobotClientOptions): RobotClient {
  const store = opts.seqStore ?? memorySeqStore();
  const log = opts.logger ?? silentLogger;
  const ackTimeoutMs = opts.ackTimeoutMs ?? 5000;
  const beatIntervalMs = opts.beatIntervalMs ?? 1000;
  const reconnectDelayMs = opts.reconnectDelayMs ?? 500;
  const reconnectDelayMaxMs = opts.reconnectDelayMaxMs ?? 5000;
  const status = opts.status ?? (() => ({ battery: 1, status: "ok" as const }));
  if (!(ackTimeoutMs > 0) || !(beatIntervalMs > 0) || !(reconnectDelayMs > 0)) throw new RangeError("createRobotClient: intervals must be positive");

  let last = store.load();
  const assign = () => {
    last += 1;
    store.save(last);
    return last;
  };

  const outbox: Outgoing[] = [];
  let state: LinkState = "connecting";
  let refusal: string | null = null;
  let helloSeq = assign();
  let helloAcked = false;
  let online = false;
  let inFlight = false;
  let paused = false;
  // Bumped on every connect and disconnect so that late callbacks of an old connection do nothing.
  let generation = 0;
  let retryAttempts = 0;
  let helloResyncs = 0;
  let beatTimer: ReturnType<typeof setInterval> | null = null;
  let retryTimer: ReturnType<typeof setTimeout> | null = null;
  let reconnectTimer: ReturnType<typeof setTimeout> | null = null;
  let replaced = false;
  let stopCode: StopCode = "closed";
  let reconnectAttempts = 0;

  const base = opts.url.replace(/\/+$/, "");
  const socket: Socket = io(`${base}/robot`, {
    auth: { robot: opts.robotId, key: opts.key },
    transports: ["websocket"],
    forceNew: true,
    autoConnect: false,
    reconnectionDelay: reconnectDelayMs,
    reconnectionDelayMax: reconnectDelayMaxMs,
  });

  const setState = (next: LinkState, detail: { code?: string; reason?: string } = {}) => {
    if (state === next) return;
    state = next;
    opts.onState?.(next, detail);
  };

  const isStopped = () => state === "closed" || state === "refused" || state === "replaced";

  const clearTimers = () => {
    if (beatTimer) clearInterval(beatTimer);
    if (retryTimer) clearTimeout(retryTimer);
    if (reconnectTimer) clearTimeout(reconnectTimer);
    beatTimer = retryTimer = reconnectTimer = null;
  };

  const stop = (final: "closed" | "refused" | "replaced", code: StopCode) => {
    if (isStopped()) return;
    stopCode = code;
    clearTimers();
    online = false;
    generation += 1;
    setState(final, { code });
    socket.disconnect();
    const error = new LinkStoppedError(code);
    for (const entry of outbox.splice(0)) entry.reject(error);
  };

  const backoff = () => Math.min(RETRY_DELAY_MAX_MS, RETRY_DELAY_MS * 2 ** Math.min(retryAttempts++, 5));

  const raiseCounter = (floor: number) => {
    if (last >= floor) return;
    last = floor;
    store.save(last);
  };

  // Untransmitted messages may take new numbers: the server has never seen them.
  const renumberUntransmitted = (floor: number) => {
    const first = outbox.findIndex((entry) => !entry.transmitted);
    if (first < 0 || outbox[first].message.seq > floor) return;
    raiseCounter(floor);
    for (let i = first; i < outbox.length; i++) outbox[i].message.seq = assign();
  };

  const adoptLastSeq = (lastSeq: number | undefined) => {
    if (lastSeq === undefined || lastSeq <= last) return;
    log.warn({ robot: opts.robotId, lastSeq, local: last }, "server has seen higher seqs than this robot's counter; continuing after them");
    renumberUntransmitted(lastSeq);
    raiseCounter(lastSeq);
  };

  const sendHello = (gen: number) => {
    const hello = { seq: helloSeq, at: Date.now(), protocol: PROTOCOL_VERSION, ...opts.hello };
    socket.timeout(ackTimeoutMs).emit("hello", hello, (err: Error | null, raw: unknown) => {
      if (gen !== generation) return;
      if (err) {
        log.warn({ robot: opts.robotId, seq: hello.seq }, "hello not acknowledged in time; sending it again");
        sendHello(gen);
        return;
      }
      const parsed = AckSchema.safeParse(raw);
      if (!parsed.success) {
        log.warn({ robot: opts.robotId, seq: hello.seq }, "hello ack does not match the protocol; retrying");
        retryTimer = setTimeout(() => gen === generation && sendHello(gen), backoff());
        return;
      }
      const ack = parsed.data;
      opts.onAck?.("hello", hello.seq, ack);
      if (ack.ok) {
        helloAcked = true;
        retryAttempts = 0;
        helloResyncs = 0;
        adoptLastSeq(ack.lastSeq);
        online = true;
        setState("online");
        opts.onHello?.(ack);
        startBeats(gen);
        pump(gen);
        return;
      }
      if (ack.code === "out_of_order" && helloResyncs < HELLO_RESYNC_LIMIT) {
        helloResyncs += 1;
        raiseCounter(ack.lastSeq ?? hello.seq);
        helloSeq = assign();
        renumberUntransmitted(helloSeq);
        log.warn({ robot: opts.robotId, lastSeq: ack.lastSeq, seq: helloSeq }, "hello refused as out of order; resyncing past the server's lastSeq");
        sendHello(gen);
        return;
      }
      if (RETRIED_ACK_CODES.has(ack.code) || ack.code === "out_of_order") {
        retryTimer = setTimeout(() => gen === generation && sendHello(gen), backoff());
        return;
      }
      log.warn({ robot: opts.robotId, code: ack.code, message: ack.message }, "hello refused");
      refusal = ack.code;
      stop("refused", ack.code);
    });
  };

  const startBeats = (gen: number) => {
    if (beatTimer) clearInterval(beatTimer);
    const beat = () => {
      if (gen !== generation || !online) return;
      // One beat waiting is enough; a queue of them would only repeat the same news.
      if (outbox.some((entry) => entry.event === "beat" && !entry.transmitted)) return;
      client.send("beat", status()).catch(() => {});
    };
    beat();
    beatTimer = setInterval(beat, beatIntervalMs);
  };

  const pump = (gen: number) => {
    if (gen !== generation || !online || inFlight || outbox.length === 0) return;
    const entry = outbox[0];
    inFlight = true;
    entry.transmitted = true;
    socket.timeout(ackTimeoutMs).emit(entry.event, entry.message, (err: Error | null, raw: unknown) => {
      if (gen !== generation) return;
      inFlight = false;
      if (err) {
        log.warn({ robot: opts.robotId, seq: entry.message.seq, event: entry.event }, "no acknowledgement in time; sending again");
        pump(gen);
        return;
      }
      const parsed = AckSchema.safeParse(raw);
      if (parsed.success) opts.onAck?.(entry.event, entry.message.seq, parsed.data);
      if (!parsed.success || (parsed.data.ok === false && RETRIED_ACK_CODES.has(parsed.data.code))) {
        inFlight = true;
        retryTimer = setTimeout(() => {
          retryTimer = null;
          if (gen !== generation) return;
          inFlight = false;
          pump(gen);
        }, backoff());
        return;
      }
      const ack = parsed.data;
      retryAttempts = 0;
      if (ack.seq !== null && ack.seq !== entry.message.seq) log.warn({ robot: opts.robotId, sent: entry.message.seq, acked: ack.seq }, "ack names another seq");
      outbox.shift();
      if (!ack.ok) {
        log.warn({ robot: opts.robotId, seq: entry.message.seq, event: entry.event, code: ack.code, message: ack.message }, "message refused");
        if (ack.code === "out_of_order") adoptLastSeq(ack.lastSeq);
      }
      entry.resolve(ack);
      pump(gen);
    });
  };

  const scheduleReconnect = () => {
    if (reconnectTimer || isStopped() || paused) return;
    const delay = Math.min(reconnectDelayMaxMs, reconnectDelayMs * 2 ** Math.min(reconnectAttempts++, 8));
    reconnectTimer = setTimeout(() => {
      reconnectTimer = null;
      if (!isStopped() && !paused && !socket.connected) socket.connect();
    }, delay);
  };

  socket.on("connect", () => {
    generation += 1;
    reconnectAttempts = 0;
    inFlight = false;
    online = false;
    retryAttempts = 0;
    helloResyncs = 0;
    // A fresh seq for this hello unless messages wait: then the hello must stay below them.
    if (helloAcked && outbox.length === 0) helloSeq = assign();
    sendHello(generation);
  });

  socket.on("disconnect", (reason: string) => {
    generation += 1;
    online = false;
    inFlight = false;
    if (beatTimer) clearInterval(beatTimer);
    if (retryTimer) clearTimeout(retryTimer);
    beatTimer = retryTimer = null;
    if (isStopped()) return;
    if (replaced) {
      stop("replaced", "replaced");
      return;
    }
    setState("offline", { reason });
    log.info({ robot: opts.robotId, reason, pending: outbox.length }, "link down");
    // The manager retries transport failures by itself, but not a server-side disconnect.
    if (reason === "io server disconnect") scheduleReconnect();
  });

  socket.on("connect_error", (err: Error & { data?: { code?: string } }) => {
    const code = err.data?.code ?? err.message;
    // Only the server's middleware sends a code; a transport failure is not a refusal.
    if (err.data?.code) refusal = code;
    if (FINAL_HANDSHAKE_CODES.has(code)) {
      log.warn({ robot: opts.robotId, code }, "handshake refused; not retrying");
      stop("refused", code as StopCode);
      return;
    }
    setState("offline", { code });
    if (!socket.active) scheduleReconnect();
  });

  socket.on("replaced", () => {
    replaced = true;
    log.warn({ robot: opts.robotId }, "another connection took over this robot");
  });

  const serverEvent = <T>(name: string, schema: { safeParse(raw: unknown): { success: true; data: T } | { success: false } }, handler?: (msg: T) => void) => {
    socket.on(name, (raw: unknown) => {
      const parsed = schema.safeParse(raw);
      if (!parsed.success) {
        log.warn({ robot: opts.robotId, event: name }, "server message does not match the protocol; ignored");
        return;
      }
      handler?.(parsed.data);
    });
  };
  serverEvent("next", NextSchema, opts.onNext);
  serverEvent("hold", HoldSchema, opts.onHold);
  serverEvent("release", ReleaseSchema, opts.onRelease);
  serverEvent("done", DoneSchema, opts.onDone);
  serverEvent("tune", TuneSchema, opts.onTune);
  serverEvent("fault", SimFaultSchema, opts.onFault);

  const client: RobotClient = {
    send(event, payload) {
      if (isStopped()) return Promise.reject(new LinkStoppedError(stopCode));
      return new Promise<Ack>((resolve, reject) => {
        const message = { ...(payload as Record<string, unknown>), seq: assign(), at: Date.now() };
        outbox.push({ event, message, transmitted: false, resolve, reject });
        pump(generation);
      });
    },
    get state() {
      return state;
    },
    get refusal() {
      return refusal;
    },
    get lastSeq() {
      return last;
    },
    get pending() {
      return outbox.length;
    },
    pause() {
      if (isStopped() || paused) return;
      paused = true;
      socket.disconnect();
      setState("offline", { reason: "paused" });
    },
    resume() {
      if (isStopped() || !paused) return;
      paused = false;
      setState("connecting");
      socket.connect();
    },
    close() {
      stop("closed", "closed");
    },
  };

  socket.connect();
  return client;
}
