/**
 * The roster's routes with real next-auth sessions against the running server: the role
 * fences answer 401 and 403 with the error shape, and a key is in the register answer only.
 */
import { describe, expect, inject, it } from "vitest";
import { DEMO_SENSORS } from "../../db/seed";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");

async function send(method: string, path: string, cookie: string, body?: unknown) {
  const res = await fetch(`${appUrl}${path}`, {
    method,
    headers: { cookie, ...(body === undefined ? {} : { "content-type": "application/json" }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, text: await res.text() };
}

describe("roster routes with signed-in sessions", () => {
  it("fences each admin action and never answers a key twice", async () => {
    const admin = await signInAs(appUrl, "admin@tessera.test");
    const operator = await signInAs(appUrl, "operator@tessera.test");
    const viewer = await signInAs(appUrl, "viewer@tessera.test");
    const made = await send("POST", "/api/robots", admin, { name: "Fenced e2e", drive: "differential", sensors: DEMO_SENSORS, simulated: true });
    expect(made.status).toBe(201);
    const { robot, key } = JSON.parse(made.text) as { robot: { id: string }; key: string };

    for (const [who, cookie] of [["operator", operator], ["viewer", viewer]] as const) {
      const rotate = await send("POST", `/api/robots/${robot.id}/key`, cookie);
      expect(rotate.status).toBe(403);
      expect(JSON.parse(rotate.text)).toEqual({ error: { code: "forbidden:key", message: `This needs the admin role; you are ${who}.` } });
      expect((await send("POST", `/api/robots/${robot.id}/retire`, cookie)).status).toBe(403);
      expect((await send("PUT", `/api/robots/${robot.id}/settings`, cookie, {})).status).toBe(403);
      expect((await send("POST", `/api/robots/${robot.id}/tune`, cookie)).status).toBe(403);
    }
    const anonymous = await send("POST", `/api/robots/${robot.id}/key`, "");
    expect(anonymous.status).toBe(401);
    expect(JSON.parse(anonymous.text)).toEqual({ error: { code: "unauthorized:key", message: "Sign in first." } });

    const bad = await send("PUT", `/api/robots/${robot.id}/settings`, admin, { motion: {}, sensing: {}, gains: { kp: -1, ki: 0, kd: 0 } });
    expect(bad.status).toBe(422);
    expect(Object.keys((JSON.parse(bad.text) as { error: { fields: Record<string, string[]> } }).error.fields)).toContain("gains.kp");

    for (const path of ["/api/robots", `/api/robots/${robot.id}`, `/api/robots/${robot.id}/settings`]) {
      const answer = await send("GET", path, viewer);
      expect(answer.status).toBe(200);
      expect(answer.text).not.toContain(key);
      expect(answer.text).not.toMatch(/keyHash|key_hash/);
    }
    expect((await send("POST", `/api/robots/${robot.id}/retire`, admin)).status).toBe(200);
  });
});
