/** A sliding-window counter per key, in memory: enough to keep a public form from being used as a mail cannon. */
export interface RateLimiter {
  /** Counts one attempt for `key`; false when the key already used its allowance in the window. */
  take(key: string, now?: number): boolean;
  /** Whether `key` has used its allowance in the window, without counting an attempt. */
  blocked(key: string, now?: number): boolean;
}

export function createRateLimiter(max: number, windowMs: number): RateLimiter {
  const hits = new Map<string, number[]>();
  const recentOf = (key: string, now: number) => (hits.get(key) ?? []).filter((t) => now - t < windowMs);
  return {
    take(key, now = Date.now()) {
      const recent = recentOf(key, now);
      if (recent.length >= max) {
        hits.set(key, recent);
        return false;
      }
      recent.push(now);
      hits.set(key, recent);
      // Keys of addresses nobody asks for again must not pile up forever.
      if (hits.size > 10_000) for (const [k, times] of hits) if (times.every((t) => now - t >= windowMs)) hits.delete(k);
      return true;
    },
    blocked(key, now = Date.now()) {
      return recentOf(key, now).length >= max;
    },
  };
}
