/**
 * A newcomer signed in as the demo admin registers a robot on the roster, sees its key
 * once with a copy button, loses it on reload, and opens the robot's page; a viewer sees
 * the roster without the admin controls. Screenshots land in test-results/roster.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { io as connect } from "socket.io-client";
import { describe, expect, inject, it } from "vitest";
import { DEMO_SENSORS } from "../../db/seed";
import { ROOT } from "../../scripts/local-env";
import { withBrowser } from "../support/browser";
import { signInAs } from "../../scripts/sign-in";

const appUrl = inject("appUrl");
const shots = path.join(ROOT, "test-results", "roster");
mkdirSync(shots, { recursive: true });

async function signIn(page: Page, email: string) {
  await page.goto(`${appUrl}/roster`);
  await page.waitForURL(/\/sign-in/);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill("demo-tessera");
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${appUrl}/roster`);
}

/** Whether a robot may connect with this key: true, or the handshake's refusal code. */
function tryKey(robot: string, key: string): Promise<true | string> {
  return new Promise((resolve) => {
    const socket = connect(`${appUrl}/robot`, { auth: { robot, key }, reconnection: false, transports: ["websocket"] });
    socket.on("connect", () => {
      socket.close();
      resolve(true);
    });
    socket.on("connect_error", (err) => {
      socket.close();
      resolve(String((err as Error & { data?: { code?: string } }).data?.code));
    });
  });
}

describe("roster", () => {
  it("lets the admin register a robot and see its key once", async () => {
    await withBrowser(async (context) => {
      await context.grantPermissions(["clipboard-read", "clipboard-write"], { origin: appUrl });
      const page = await context.newPage();
      await page.setViewportSize({ width: 1280, height: 900 });
      await signIn(page, "admin@tessera.test");
      await page.getByRole("table", { name: "Robots on the roster" }).waitFor();
      expect(await page.getByRole("link", { name: "Kestrel" }).count()).toBe(1);

      await page.getByRole("button", { name: "Register", exact: true }).click();
      const form = page.getByRole("form", { name: "Register a robot" });
      await form.getByLabel("Name").fill("Heron e2e");
      await form.getByLabel("Drive").selectOption("bicycle");
      await form.getByLabel("Simulated robot").check();
      await form.getByLabel("Sensor 2 bearing").fill("75");
      await form.getByRole("button", { name: "Remove sensor 3" }).click();
      await form.getByRole("button", { name: "Add sensor" }).click();
      await form.getByLabel("Sensor 4 id").fill("us-rear");
      await form.getByLabel("Sensor 4 bearing").fill("200");
      await form.getByRole("button", { name: "Register robot" }).click();
      expect(await form.getByText("bearing is from −180° to 180°").count()).toBe(1);
      await form.getByLabel("Sensor 4 bearing").fill("180");
      await page.screenshot({ path: path.join(shots, "register-form.png"), fullPage: true });
      await form.getByRole("button", { name: "Register robot" }).click();

      const panel = page.getByRole("region", { name: "Secret key, shown once" });
      await panel.waitFor();
      expect(await panel.innerText()).toMatch(/shown once/);
      const key = await panel.getByTestId("secret-key").innerText();
      const robotId = await panel.getByTestId("new-robot-id").innerText();
      expect(key).toMatch(/^tsk_[A-Za-z0-9_-]{43}$/);
      await panel.getByRole("button", { name: "Copy key" }).click();
      await panel.getByText("Copied to the clipboard.").waitFor();
      expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(key);
      await page.getByRole("link", { name: "Heron e2e" }).waitFor();
      await page.screenshot({ path: path.join(shots, "key-once.png"), fullPage: true });
      expect(await tryKey(robotId, key)).toBe(true);

      await page.reload();
      await page.getByRole("link", { name: "Heron e2e" }).waitFor();
      expect(await page.getByRole("region", { name: "Secret key, shown once" }).count()).toBe(0);
      expect(await page.content()).not.toContain(key);

      await page.getByRole("link", { name: "Heron e2e" }).click();
      await page.waitForURL(`${appUrl}/roster/${robotId}`);
      await page.getByRole("heading", { name: "Heron e2e" }).waitFor();
      expect(await page.getByTestId("robot-state").innerText()).toContain("Bicycle");
      expect(await page.getByText("us-left: range, bearing 75°, up to 3 m").count()).toBe(1);
      expect(await page.getByText("us-rear: range, bearing 180°, up to 3 m").count()).toBe(1);
      const settings = page.getByRole("form", { name: "Robot settings" });
      await expect.poll(() => settings.getByLabel("Turn: as told").inputValue()).toBe("0.8");
      expect(await page.content()).not.toContain(key);

      await settings.getByLabel("kp").fill("4.5");
      await settings.getByLabel("Weight: random").fill("0.3");
      await settings.getByRole("button", { name: "Save settings" }).click();
      expect(await settings.getByText("hit, short, max and rand must add up to 1").count()).toBe(1);
      await settings.getByLabel("Weight: random").fill("0.1");
      await settings.getByRole("button", { name: "Save settings" }).click();
      await settings.getByText(/Saved\. The live filter uses these parameters/).waitFor();
      expect(await page.getByRole("note", { name: "Safety caution" }).count()).toBe(1);
      await page.screenshot({ path: path.join(shots, "robot-page.png"), fullPage: true });
      await page.reload();
      // The form fills its fields once it is hydrated.
      await expect.poll(() => page.getByRole("form", { name: "Robot settings" }).getByLabel("kp").inputValue()).toBe("4.5");
      await page.getByRole("form", { name: "Robot settings" }).getByRole("button", { name: "Reset to defaults" }).click();
      await page.getByText("Back to the defaults for this drive, and applied.").waitFor();
      await expect.poll(() => page.getByRole("form", { name: "Robot settings" }).getByLabel("kp").inputValue()).toBe("6");

      await page.goto(`${appUrl}/roster`);
      await page.getByRole("button", { name: "Rotate key of Heron e2e" }).click();
      await page.getByRole("button", { name: "Rotate key", exact: true }).click();
      const rotated = page.getByRole("region", { name: "Secret key, shown once" });
      await rotated.waitFor();
      const newKey = await rotated.getByTestId("secret-key").innerText();
      expect(newKey).not.toBe(key);
      expect(await tryKey(robotId, key)).toBe("bad_key");
      expect(await tryKey(robotId, newKey)).toBe(true);

      await page.getByRole("button", { name: "Retire Heron e2e" }).click();
      await page.getByRole("button", { name: "Retire robot" }).click();
      await expect.poll(() => page.getByRole("link", { name: "Heron e2e" }).count()).toBe(0);
      expect(await tryKey(robotId, newKey)).toBe("retired");
    });
  });

  it("shows a viewer a robot's missions and recent certainty", async () => {
    const admin = await signInAs(appUrl, "admin@tessera.test");
    const operator = await signInAs(appUrl, "operator@tessera.test");
    const post = async (path: string, cookie: string, body: unknown) => {
      const res = await fetch(`${appUrl}${path}`, { method: "POST", headers: { "content-type": "application/json", cookie }, body: JSON.stringify(body) });
      return (await res.json()) as Record<string, unknown>;
    };
    const made = (await post("/api/robots", admin, { name: "Plover e2e", drive: "differential", sensors: DEMO_SENSORS, simulated: true })) as { robot: { id: string }; key: string };
    const id = made.robot.id;
    const socket = connect(`${appUrl}/robot`, { auth: { robot: id, key: made.key }, transports: ["websocket"] });
    try {
      let seq = 1;
      await socket.timeout(5000).emitWithAck("hello", { seq, at: Date.now(), protocol: 1, model: "probe", drive: "differential", sensors: DEMO_SENSORS });
      // Enough sensed messages for a few belief snapshots (one every 20 fused steps), with the robot's view changing.
      for (let i = 0; i < 42; i++) {
        const readings = [
          { sensor: "us-front", rangeM: 0.3 + (i % 5) * 0.3 },
          { sensor: "us-left", rangeM: 0.46 },
          { sensor: "us-right", rangeM: 0.15 + (i % 3) * 0.3 },
          { sensor: "floor", mark: 0 },
        ];
        await socket.timeout(5000).emitWithAck("sensed", { seq: ++seq, at: Date.now(), readings });
      }
      await post(`/api/robots/${id}/relocate`, operator, { row: 10, col: 16, heading: "W" });
      const dispatched = (await post("/api/missions", operator, { robotId: id, goal: { row: 10, col: 4 } })) as { mission: { id: number } };
      await post(`/api/robots/${id}/cancel`, operator, {});

      await withBrowser(async (context) => {
        const page = await context.newPage();
        await page.setViewportSize({ width: 1280, height: 900 });
        await signIn(page, "viewer@tessera.test");
        await page.goto(`${appUrl}/roster/${id}`);
        await page.getByRole("heading", { name: "Plover e2e" }).waitFor();
        expect(await page.getByTestId("robot-state").innerText()).toContain("(10, 16) W");
        const chart = page.getByRole("img", { name: /Certainty over the last \d+ belief snapshots/ });
        await chart.waitFor();
        expect(Number((await chart.getAttribute("aria-label"))!.match(/last (\d+)/)![1])).toBeGreaterThanOrEqual(4);
        const link = page.getByRole("table", { name: "Missions of this robot" }).getByRole("link", { name: `#${dispatched.mission.id}` });
        expect(await link.getAttribute("href")).toBe(`/logbook/${dispatched.mission.id}`);
        await page.screenshot({ path: path.join(shots, "robot-page-certainty.png"), fullPage: true });
      });
    } finally {
      socket.close();
      await post(`/api/robots/${id}/retire`, admin, {});
    }
  });

  it("shows a viewer the roster without the admin controls", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await signIn(page, "viewer@tessera.test");
      await page.getByRole("link", { name: "Otter" }).waitFor();
      expect(await page.getByRole("button", { name: "Register", exact: true }).count()).toBe(0);
      expect(await page.getByRole("button", { name: /Rotate key/ }).count()).toBe(0);
      await page.getByRole("link", { name: "Otter" }).click();
      await page.getByRole("heading", { name: "Otter" }).waitFor();
      expect(await page.getByRole("button", { name: "Save settings" }).count()).toBe(0);
      expect(await page.getByRole("form", { name: "Robot settings" }).getByLabel("kp").getAttribute("readonly")).not.toBeNull();
      await page.screenshot({ path: path.join(shots, "robot-page-viewer.png"), fullPage: true });
    });
  });
});
