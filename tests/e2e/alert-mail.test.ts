/**
 * Alert e-mails (issue 7): a robot that goes offline mid-mission is mailed to the on-call
 * list through the server's mail catcher, and a robot that flaps sends one mail per window
 * while every alert still reaches the live floor's feed.
 */
import { io as connect, type Socket } from "socket.io-client";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_SENSORS } from "../../db/seed";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const name = `Alert probe ${Date.now()}`;
let admin = "";
let operator = "";
let robotId = "";
let key = "";
let operatorId = 0;
let seq = 0;

async function json(path: string, cookie: string, init: RequestInit = {}) {
  const res = await fetch(`${appUrl}${path}`, { ...init, headers: { cookie, "content-type": "application/json", ...init.headers } });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

async function online(): Promise<Socket> {
  const socket = connect(`${appUrl}/robot`, { auth: { robot: robotId, key }, transports: ["websocket"], reconnection: false });
  await socket.timeout(5000).emitWithAck("hello", { seq: ++seq, at: Date.now(), protocol: 1, model: "probe", drive: "differential", sensors: DEMO_SENSORS });
  return socket;
}

async function robotAlerts(): Promise<{ kind: string }[]> {
  const { body } = await json("/api/alerts", operator);
  return (body.alerts as { robotId: string | null; kind: string }[]).filter((a) => a.robotId === robotId);
}

async function mailsAbout(): Promise<{ to: string[]; subject: string; text: string }[]> {
  const { body } = await json("/api/mail?limit=100", admin);
  return (body.items as { to: string[]; subject: string; text: string }[]).filter((m) => m.subject.includes(name) && m.to.includes("operator@tessera.test"));
}

beforeAll(async () => {
  admin = await signInAs(appUrl, "admin@tessera.test");
  operator = await signInAs(appUrl, "operator@tessera.test");
  const crew = await json("/api/users", admin);
  operatorId = (crew.body.users as { id: number; email: string }[]).find((u) => u.email === "operator@tessera.test")!.id;
  expect((await json(`/api/users/${operatorId}`, admin, { method: "PATCH", body: JSON.stringify({ onCall: true }) })).status).toBe(200);
  const made = await json("/api/robots", admin, { method: "POST", body: JSON.stringify({ name, drive: "differential", sensors: DEMO_SENSORS, simulated: true }) });
  ({ robot: { id: robotId }, key } = made.body as { robot: { id: string }; key: string });
});

afterAll(async () => {
  await json(`/api/robots/${robotId}/cancel`, operator, { method: "POST", body: "{}" });
  await json(`/api/users/${operatorId}`, admin, { method: "PATCH", body: JSON.stringify({ onCall: false }) });
});

describe("alert e-mails", () => {
  it("mails the on-call list when a robot goes offline mid-mission, once per window however often it flaps", async () => {
    let socket = await online();
    expect((await json(`/api/robots/${robotId}/relocate`, operator, { method: "POST", body: JSON.stringify({ row: 10, col: 16, heading: "W" }) })).status).toBe(200);
    expect((await json("/api/missions", operator, { method: "POST", body: JSON.stringify({ robotId, goal: { row: 10, col: 4 } }) })).status).toBe(201);
    socket.close();
    await expect.poll(async () => (await robotAlerts()).filter((a) => a.kind === "offline").length, { timeout: 15_000, interval: 250 }).toBe(1);
    await expect.poll(async () => (await mailsAbout()).length, { timeout: 10_000, interval: 250 }).toBe(1);
    const [mail] = await mailsAbout();
    expect(mail.subject).toBe(`Tessera: ${name} offline`);
    expect(mail.to).toEqual(["operator@tessera.test"]);
    expect(mail.text).toContain("/floor");

    // Back, and gone again: a second alert on the feed, no second mail within the window.
    socket = await online();
    socket.close();
    await expect.poll(async () => (await robotAlerts()).filter((a) => a.kind === "offline").length, { timeout: 15_000, interval: 250 }).toBe(2);
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect(await mailsAbout()).toHaveLength(1);
  });
});
