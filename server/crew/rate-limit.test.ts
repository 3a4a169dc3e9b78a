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
