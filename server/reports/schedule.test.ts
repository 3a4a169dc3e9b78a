import { afterEach, describe, expect, it, vi } from "vitest";
import { SHIFT_MS, type ShiftRange } from "../../lib/protocol/reports";
import { nextShiftEnd, scheduleShiftEnds } from "./schedule";

afterEach(() => vi.useRealTimers());

const local = (y: number, mo: number, d: number, h: number, mi: number, s = 0) => new Date(y, mo, d, h, mi, s).getTime();

describe("nextShiftEnd", () => {
  it("is later today before the time, tomorrow at or after it", () => {
    expect(nextShiftEnd(local(2026, 2, 1, 9, 15), "18:30")).toBe(local(2026, 2, 1, 18, 30));
    expect(nextShiftEnd(local(2026, 2, 1, 18, 30), "18:30")).toBe(local(2026, 2, 2, 18, 30));
    expect(nextShiftEnd(local(2026, 2, 1, 23, 59, 59), "00:00")).toBe(local(2026, 2, 2, 0, 0));
    expect(nextShiftEnd(local(2026, 1, 28, 22, 0), "06:05")).toBe(local(2026, 2, 1, 6, 5));
  });
});

describe("scheduleShiftEnds", () => {
  it("sends the shift that just ended at each shift end, every day, and stops when told", async () => {
    vi.useFakeTimers({ now: local(2026, 2, 1, 12, 0) });
    const sent: ShiftRange[] = [];
    const stop = scheduleShiftEnds("14:00", async (range) => void sent.push(range));
    await vi.advanceTimersByTimeAsync(2 * 3600_000 - 1);
    expect(sent).toEqual([]);
    await vi.advanceTimersByTimeAsync(1);
    expect(sent).toEqual([{ from: local(2026, 2, 1, 14, 0) - SHIFT_MS, to: local(2026, 2, 1, 14, 0) }]);
    await vi.advanceTimersByTimeAsync(24 * 3600_000);
    expect(sent.map((r) => r.to)).toEqual([local(2026, 2, 1, 14, 0), local(2026, 2, 2, 14, 0)]);
    stop();
    await vi.advanceTimersByTimeAsync(48 * 3600_000);
    expect(sent).toHaveLength(2);
  });

  it("keeps the schedule after a failed send", async () => {
    vi.useFakeTimers({ now: local(2026, 2, 1, 13, 0) });
    let calls = 0;
    const stop = scheduleShiftEnds("14:00", async () => {
      calls += 1;
      throw new Error("mail server down");
    });
    await vi.advanceTimersByTimeAsync(3600_000 + 24 * 3600_000);
    expect(calls).toBe(2);
    stop();
  });
});
