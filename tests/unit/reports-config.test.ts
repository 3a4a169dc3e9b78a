import { afterEach, describe, expect, it } from "vitest";
import { reportsConfig, webhookConfig } from "../../server/config";

const NAMES = ["TESSERA_SHIFT_END", "ALERT_WEBHOOK_URL", "ALERT_WEBHOOK_SECRET", "ALERT_WEBHOOK_BASE_DELAY_MS", "ALERT_WEBHOOK_TRIES"];
const saved = Object.fromEntries(NAMES.map((n) => [n, process.env[n]]));

afterEach(() => {
  for (const n of NAMES) {
    if (saved[n] === undefined) delete process.env[n];
    else process.env[n] = saved[n];
  }
});

function set(values: Record<string, string | undefined>) {
  for (const n of NAMES) delete process.env[n];
  Object.assign(process.env, values);
}

describe("reports settings", () => {
  it("reads the shift end as HH:MM and refuses other forms", () => {
    set({});
    expect(reportsConfig()).toEqual({ shiftEnd: null });
    set({ TESSERA_SHIFT_END: "06:30" });
    expect(reportsConfig()).toEqual({ shiftEnd: "06:30" });
    set({ TESSERA_SHIFT_END: "6pm" });
    expect(() => reportsConfig()).toThrow("TESSERA_SHIFT_END must be a local time as HH:MM");
    set({ TESSERA_SHIFT_END: "24:00" });
    expect(() => reportsConfig()).toThrow("HH:MM");
  });

  it("configures the webhook only with both URL and secret, with backoff defaults", () => {
    set({});
    expect(webhookConfig()).toBeNull();
    set({ ALERT_WEBHOOK_URL: "https://hooks.team.test/a", ALERT_WEBHOOK_SECRET: "sixteen-chars-ok!" });
    expect(webhookConfig()).toEqual({ url: "https://hooks.team.test/a", secret: "sixteen-chars-ok!", baseDelayMs: 1000, tries: 5 });
    set({ ALERT_WEBHOOK_URL: "https://hooks.team.test/a" });
    expect(() => webhookConfig()).toThrow("ALERT_WEBHOOK_URL and ALERT_WEBHOOK_SECRET are set together or not at all");
    set({ ALERT_WEBHOOK_URL: "ftp://hooks.team.test/a", ALERT_WEBHOOK_SECRET: "sixteen-chars-ok!" });
    expect(() => webhookConfig()).toThrow("ALERT_WEBHOOK_URL: must be an http(s) URL");
    set({ ALERT_WEBHOOK_URL: "https://hooks.team.test/a", ALERT_WEBHOOK_SECRET: "short" });
    expect(() => webhookConfig()).toThrow("ALERT_WEBHOOK_SECRET: must be at least 16 characters");
  });
});
