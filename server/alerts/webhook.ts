/**
 * The outgoing alert webhook: every alert the fleet raises is POSTed as JSON to the URL an
 * admin configured, signed so the receiver can tell it came from this Tessera.
 *
 *   x-tessera-timestamp: <epoch ms of this try>
 *   x-tessera-signature: sha256=<hex HMAC-SHA256 of "<timestamp>.<raw body>" with the secret>
 *
 * A try that fails (network error, timeout, 408, 429 or 5xx) is repeated after the base
 * delay, doubling each time, up to the configured number of tries; other 4xx answers will
 * not change on repeat and end the delivery. Each try is signed afresh, so a receiver may
 * refuse stale timestamps. Deliveries run beside the fleet and never hold it up.
 */
import { createHmac } from "node:crypto";
import type { AlertKind } from "../../lib/vocabulary";
import type { WebhookConfig } from "../config";
import type { Fleet, FleetEvents } from "../fleet/fleet";
import { logger } from "../logger";

/** The JSON body of one alert. */
export interface WebhookAlert {
  id: number;
  kind: AlertKind;
  robotId: string | null;
  robotName?: string;
  message: string;
  /** When the alert was raised, epoch ms. */
  at: number;
  floorplanId: number | null;
}

const TRY_TIMEOUT_MS = 10_000;

/** The signature header's value for a body sent at `timestamp`. */
export function webhookSignature(secret: string, timestamp: string, body: string): string {
  return `sha256=${createHmac("sha256", secret).update(`${timestamp}.${body}`).digest("hex")}`;
}

function retryable(status: number): boolean {
  return status === 408 || status === 429 || status >= 500;
}

/** Waits `ms`, or less if `signal` aborts; the abort listener goes with the wait, since the signal outlives many of them. */
function pause(ms: number, signal: AbortSignal): Promise<void> {
  return new Promise((resolve) => {
    const done = () => {
      clearTimeout(timer);
      signal.removeEventListener("abort", done);
      resolve();
    };
    const timer = setTimeout(done, ms);
    signal.addEventListener("abort", done, { once: true });
  });
}

/** Delivers one alert, retrying with backoff; true once the receiver answered 2xx. */
export async function deliverWebhookAlert(cfg: WebhookConfig, alert: WebhookAlert, signal: AbortSignal = new AbortController().signal): Promise<boolean> {
  const body = JSON.stringify(alert);
  for (let attempt = 1; attempt <= cfg.tries && !signal.aborted; attempt++) {
    const timestamp = String(Date.now());
    let failure: string;
    try {
      const res = await fetch(cfg.url, {
        method: "POST",
        headers: { "content-type": "application/json", "x-tessera-timestamp": timestamp, "x-tessera-signature": webhookSignature(cfg.secret, timestamp, body) },
        body,
        signal: AbortSignal.any([signal, AbortSignal.timeout(TRY_TIMEOUT_MS)]),
      });
      await res.body?.cancel();
      if (res.ok) return true;
      failure = `answered ${res.status}`;
      if (!retryable(res.status)) {
        logger.error({ alert: alert.id, status: res.status, attempt }, "alert webhook refused the alert; not retrying");
        return false;
      }
    } catch (err) {
      failure = err instanceof Error ? err.message : String(err);
    }
    if (attempt === cfg.tries) {
      logger.error({ alert: alert.id, attempts: attempt, failure }, "alert webhook gave up");
      return false;
    }
    const delayMs = cfg.baseDelayMs * 2 ** (attempt - 1);
    logger.warn({ alert: alert.id, attempt, failure, retryInMs: delayMs }, "alert webhook try failed");
    await pause(delayMs, signal);
  }
  return false;
}

/**
 * Sends every alert of `fleet` to the webhook; a no-op without configuration. The stop
 * function unsubscribes and abandons retries still waiting.
 */
export function attachAlertWebhook(fleet: Pick<Fleet, "on" | "off" | "robots">, cfg: WebhookConfig | null): () => void {
  if (!cfg) return () => {};
  const stopping = new AbortController();
  const onAlert = (a: FleetEvents["alert"][0]) => {
    const robotName = a.robotId ? fleet.robots.get(a.robotId)?.name : undefined;
    const alert: WebhookAlert = { id: a.id, kind: a.kind, robotId: a.robotId, ...(robotName ? { robotName } : {}), message: a.message, at: a.createdAt, floorplanId: a.floorplanId };
    void deliverWebhookAlert(cfg, alert, stopping.signal).catch((err: unknown) => logger.error({ err, alert: a.id }, "alert webhook failed"));
  };
  fleet.on("alert", onAlert);
  logger.info({ url: new URL(cfg.url).origin }, "alert webhook attached");
  return () => {
    fleet.off("alert", onAlert);
    stopping.abort();
  };
}
