import { afterEach, describe, expect, it } from "vitest";
import { clusterConfig } from "./config";

const NAMES = ["REDIS_URL", "TESSERA_NODE_ID", "TESSERA_LEASE_TTL_MS", "TESSERA_LEASE_RENEW_MS", "TESSERA_NODE_TIMEOUT_MS", "DATABASE_URL", "NEXTAUTH_SECRET", "PORT"];
const saved = Object.fromEntries(NAMES.map((n) => [n, process.env[n]]));

function setEnv(values: Record<string, string>) {
  for (const n of NAMES) delete process.env[n];
  Object.assign(process.env, { DATABASE_URL: "mysql://t:t@127.0.0.1:3306/t", NEXTAUTH_SECRET: "x".repeat(20), ...values });
}

afterEach(() => {
  for (const n of NAMES) {
    if (saved[n] === undefined) delete process.env[n];
    else process.env[n] = saved[n];
  }
});

describe("clusterConfig", () => {
  it("is null without REDIS_URL, so one node runs without Redis", () => {
    setEnv({});
    expect(clusterConfig()).toBeNull();
  });

  it("reads the lease timings and names the node after its host and port by default", () => {
    setEnv({ REDIS_URL: "redis://127.0.0.1:6379", TESSERA_LEASE_TTL_MS: "3000", TESSERA_LEASE_RENEW_MS: "1000" });
    expect(clusterConfig()).toEqual({ redisUrl: "redis://127.0.0.1:6379", nodeId: "127.0.0.1-3000", leaseTtlMs: 3000, leaseRenewMs: 1000, nodeTimeoutMs: 2000 });
  });

  it("refuses a renewal period longer than half the lease, and a node id a lease value cannot hold, naming the variable", () => {
    setEnv({ REDIS_URL: "redis://127.0.0.1:6379", TESSERA_LEASE_TTL_MS: "3000", TESSERA_LEASE_RENEW_MS: "2000" });
    expect(() => clusterConfig()).toThrow("TESSERA_LEASE_RENEW_MS: must be at most half of TESSERA_LEASE_TTL_MS");
    setEnv({ REDIS_URL: "redis://127.0.0.1:6379", TESSERA_NODE_ID: "node:a" });
    expect(() => clusterConfig()).toThrow("TESSERA_NODE_ID");
    setEnv({ REDIS_URL: "http://127.0.0.1:6379" });
    expect(() => clusterConfig()).toThrow("REDIS_URL: must be a redis:// URL");
  });
});
