import { describe, expect, it } from "vitest";
import { createRateLimiter } from "./rate-limit";

describe("createRateLimiter", () => {
  it("allows max attempts per key within the window and again once the oldest leaves it", () => {
    const limiter = createRateLimiter(3, 1000);
    expect([0, 100, 200, 300].map((t) => limiter.take("a@tessera.test", t))).toEqual([true, true, true, false]);
    expect(limiter.take("b@tessera.test", 300)).toBe(true);
    expect(limiter.take("a@tessera.test", 999)).toBe(false);
    expect(limiter.take("a@tessera.test", 1000)).toBe(true);
    expect(limiter.take("a@tessera.test", 1001)).toBe(false);
    expect(limiter.take("a@tessera.test", 1100)).toBe(true);
  });
});

describe("blocked", () => {
  it("reports a used-up allowance without counting, and clears once the window passes", () => {
    const limiter = createRateLimiter(2, 1000);
    expect(limiter.blocked("a", 0)).toBe(false);
    expect(limiter.blocked("a", 0)).toBe(false);
    limiter.take("a", 0);
    expect(limiter.blocked("a", 10)).toBe(false);
    limiter.take("a", 20);
    expect(limiter.blocked("a", 30)).toBe(true);
    expect(limiter.blocked("b", 30)).toBe(false);
    expect(limiter.blocked("a", 1000)).toBe(false);
    expect(limiter.blocked("a", 1020)).toBe(false);
    expect(limiter.take("a", 1020)).toBe(true);
  });
});
