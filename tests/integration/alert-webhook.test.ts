/**
 * The outgoing alert webhook (issue 7, part 7): msw stands in for the team's chat or
 * paging service in this process, where the in-process fleet raises its alerts.
 */
import { createHmac } from "node:crypto";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { inject } from "vitest";
import { webhookConfig, type WebhookConfig } from "../../server/config";
import { attachAlertWebhook, deliverWebhookAlert, type WebhookAlert } from "../../server/alerts/webhook";
import { scriptedRobot, startTestServer, type TestServer } from "../support/fleet-server";

const URL_ = "https://hooks.team.test/tessera";
const SECRET = "a-shared-secret-of-this-team";
const cfg: WebhookConfig = { url: URL_, secret: SECRET, baseDelayMs: 20, tries: 4 };

interface Received {
  body: string;
  headers: Headers;
  at: number;
}

let received: Received[] = [];
let answers: number[] = [];
const receiver = setupServer(
  http.post(URL_, async ({ request }) => {
    received.push({ body: await request.text(), headers: request.headers, at: Date.now() });
    return new HttpResponse(null, { status: answers.shift() ?? 200 });
  }),
);

let server: TestServer;
const actor = { userId: null, label: "test" };

beforeAll(async () => {
  server = await startTestServer(inject("databaseUrl"), { heartbeatTimeoutMs: 500 });
  receiver.listen({ onUnhandledRequest: "bypass" });
});

afterEach(() => {
  received = [];
  answers = [];
});

afterAll(async () => {
  receiver.close();
  await server.stop();
});

/** What a receiver does: recompute the HMAC of "<timestamp>.<body>" with the shared secret. */
function verifies(r: Received, secret: string): boolean {
  const timestamp = r.headers.get("x-tessera-timestamp") ?? "";
  const expected = `sha256=${createHmac("sha256", secret).update(`${timestamp}.${r.body}`).digest("hex")}`;
  return r.headers.get("x-tessera-signature") === expected;
}

const sample: WebhookAlert = { id: 41, kind: "low_certainty", robotId: "rb-x", robotName: "Kestrel", message: "Kestrel held: certainty 22% stayed under 30% for 3 steps", at: Date.UTC(2026, 2, 1, 9, 0), floorplanId: 2 };

describe("alert webhook", () => {
  it("posts a signed JSON alert when the fleet holds a robot whose link went quiet", async () => {
    const stop = attachAlertWebhook(server.fleet, cfg);
    const scripted = await scriptedRobot(server);
    await server.fleet.relocate(scripted.robot.id, { row: 10, col: 16, heading: "W" }, actor);
    await server.fleet.dispatch(scripted.robot.id, { row: 10, col: 4 }, actor);
    scripted.socket.close();
    await expect.poll(() => received.length, { timeout: 5000 }).toBe(1);
    const [post] = received;
    expect(post.headers.get("content-type")).toBe("application/json");
    expect(Number(post.headers.get("x-tessera-timestamp"))).toBeGreaterThan(Date.now() - 10_000);
    expect(verifies(post, SECRET)).toBe(true);
    expect(verifies(post, "some-other-secret-entirely")).toBe(false);
    const body = JSON.parse(post.body) as WebhookAlert;
    const runtime = server.fleet.robots.get(scripted.robot.id)!;
    expect(body).toEqual({
      id: expect.any(Number),
      kind: "offline",
      robotId: scripted.robot.id,
      robotName: runtime.name,
      message: expect.stringMatching(new RegExp(`^${runtime.name} held: no message for \\d+ s$`)),
      at: expect.any(Number),
      floorplanId: runtime.floorplanId,
    });
    stop();
    await server.fleet.cancel(scripted.robot.id, actor);
  });

  it("retries a 500 with backoff and delivers once", async () => {
    answers = [500, 503];
    await expect(deliverWebhookAlert(cfg, sample)).resolves.toBe(true);
    expect(received).toHaveLength(3);
    expect(new Set(received.map((r) => r.body)).size).toBe(1);
    expect(received.every((r) => verifies(r, SECRET))).toBe(true);
    // 20 ms, then 40 ms: each wait doubles.
    expect(received[1].at - received[0].at).toBeGreaterThanOrEqual(18);
    expect(received[2].at - received[1].at).toBeGreaterThanOrEqual(38);
    expect(JSON.parse(received[2].body)).toEqual(sample);
  });

  it("gives up after the last try", async () => {
    answers = [500, 500, 500, 500, 500];
    await expect(deliverWebhookAlert(cfg, sample)).resolves.toBe(false);
    expect(received).toHaveLength(cfg.tries);
  });

  it("does not repeat an alert the receiver refuses outright", async () => {
    answers = [401];
    await expect(deliverWebhookAlert(cfg, sample)).resolves.toBe(false);
    expect(received).toHaveLength(1);
  });

  it("posts nothing without configuration", async () => {
    expect(process.env.ALERT_WEBHOOK_URL).toBeUndefined();
    const stop = attachAlertWebhook(server.fleet, webhookConfig());
    server.fleet.emit("alert", { id: 1, robotId: null, kind: "battery", message: "unconfigured", createdAt: Date.now(), floorplanId: null });
    await new Promise((resolve) => setTimeout(resolve, 200));
    expect(received).toHaveLength(0);
    stop();
  });
});
