import { afterEach, describe, expect, it, vi } from "vitest";
import { StorageWatch } from "./storage-watch";

afterEach(() => {
  vi.useRealTimers();
});

describe("StorageWatch", () => {
  it("stays up when the probe answers after a failed write", async () => {
    const watch = new StorageWatch({ probe: async () => 1, restore: async () => {} });
    expect(await watch.check(new Error("duplicate key"))).toBe(false);
    expect(watch.down).toBe(false);
  });

  it("goes down when the probe fails, shares one probe between failures, and restores once storage answers", async () => {
    vi.useFakeTimers();
    let answering = false;
    const probe = vi.fn(async () => {
      if (!answering) throw new Error("ECONNREFUSED");
    });
    const restore = vi.fn(async () => {});
    const watch = new StorageWatch({ probe, restore });
    expect(await Promise.all([watch.check(new Error("a")), watch.check(new Error("b"))])).toEqual([true, true]);
    expect(probe).toHaveBeenCalledTimes(1);
    watch.held.set("r1", { since: Date.now(), previous: null });
    await vi.advanceTimersByTimeAsync(3000);
    expect(watch.down).toBe(true);
    expect(restore).not.toHaveBeenCalled();
    answering = true;
    await vi.advanceTimersByTimeAsync(1000);
    expect(restore).toHaveBeenCalledTimes(1);
    expect(watch.down).toBe(false);
    expect(watch.held.size).toBe(0);
    watch.stop();
  });

  it("keeps storage down and probing while the rebuild fails", async () => {
    vi.useFakeTimers();
    const restore = vi.fn().mockRejectedValueOnce(new Error("lost again")).mockResolvedValue(undefined);
    let answering = false;
    const watch = new StorageWatch({
      probe: async () => {
        if (!answering) throw new Error("down");
      },
      restore,
    });
    await watch.check(new Error("write failed"));
    answering = true;
    await vi.advanceTimersByTimeAsync(1000);
    expect(restore).toHaveBeenCalledTimes(1);
    expect(watch.down).toBe(true);
    await vi.advanceTimersByTimeAsync(1000);
    expect(restore).toHaveBeenCalledTimes(2);
    expect(watch.down).toBe(false);
    watch.stop();
  });

  it("counts a probe that hangs as no answer", async () => {
    vi.useFakeTimers();
    const watch = new StorageWatch({ probe: () => new Promise(() => {}), restore: async () => {} });
    const checked = watch.check(new Error("timeout"));
    await vi.advanceTimersByTimeAsync(2000);
    expect(await checked).toBe(true);
    watch.stop();
  });
});
