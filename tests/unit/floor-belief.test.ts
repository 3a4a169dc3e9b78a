/** Live floor belief frames: wire decoding, per-tile mass and the all-robots blend. */
import { describe, expect, it } from "vitest";
import { quantiseMarginal } from "@/lib/protocol/ops-feed";
import { beliefFromWire, beliefMassAt, beliefMasses, blendBeliefs, bytesFromWire } from "@/components/floor/belief";

// Quantisation rounds to the nearest byte, so a mass is off by at most half a byte step.
const halfStep = (scale: number) => (0.5 / 255) * scale;

function frameOf(robotId: string, rows: number, cols: number, marginal: number[]) {
  const { scale, data } = quantiseMarginal(marginal);
  return { robotId, rows, cols, scale, data };
}

describe("bytesFromWire", () => {
  it("reads an ArrayBuffer, an offset Node Buffer view and a plain byte array", () => {
    expect([...bytesFromWire(new Uint8Array([7, 0, 255]).buffer)!]).toEqual([7, 0, 255]);
    const whole = Buffer.from([1, 2, 3, 4, 5]);
    expect([...bytesFromWire(whole.subarray(1, 4))!]).toEqual([2, 3, 4]);
    expect([...bytesFromWire([9, 200])!]).toEqual([9, 200]);
  });

  it("refuses what is not bytes", () => {
    expect(bytesFromWire("AAE=")).toBeNull();
    expect(bytesFromWire([1, 256])).toBeNull();
    expect(bytesFromWire([1.5])).toBeNull();
    expect(bytesFromWire(null)).toBeNull();
  });
});

describe("beliefFromWire and beliefMassAt", () => {
  const marginal = [0.5, 0.25, 0.125, 0.0625, 0.0625, 0];

  it("round-trips a quantised 2 × 3 marginal to within half a byte step", () => {
    const frame = frameOf("r7", 2, 3, marginal);
    const view = beliefFromWire(frame, 2, 3)!;
    expect(view.scale).toBe(0.5);
    expect(beliefMassAt(view, 0, 0)).toBeCloseTo(0.5, 12);
    expect(Math.abs(beliefMassAt(view, 0, 1) - 0.25)).toBeLessThanOrEqual(halfStep(0.5));
    expect(Math.abs(beliefMassAt(view, 1, 0) - 0.0625)).toBeLessThanOrEqual(halfStep(0.5));
    expect(beliefMassAt(view, 1, 2)).toBe(0);
  });

  it("answers 0 outside the plan", () => {
    const view = beliefFromWire(frameOf("r7", 2, 3, marginal), 2, 3)!;
    expect(beliefMassAt(view, 2, 0)).toBe(0);
    expect(beliefMassAt(view, 0, -1)).toBe(0);
  });

  it("refuses a frame for another plan shape, short data or a scale outside [0, 1]", () => {
    const frame = frameOf("r7", 2, 3, marginal);
    expect(beliefFromWire(frame, 3, 2)).toBeNull();
    expect(beliefFromWire({ ...frame, data: frame.data.subarray(0, 5) }, 2, 3)).toBeNull();
    expect(beliefFromWire({ ...frame, scale: Number.NaN }, 2, 3)).toBeNull();
    expect(beliefFromWire({ ...frame, scale: 1.5 }, 2, 3)).toBeNull();
  });
});

describe("blendBeliefs", () => {
  it("sums two robots' masses per tile, so the layer totals the number of robots", () => {
    const a = beliefFromWire(frameOf("a", 1, 4, [0.7, 0.3, 0, 0]), 1, 4)!;
    const b = beliefFromWire(frameOf("b", 1, 4, [0, 0.2, 0.65, 0.15]), 1, 4)!;
    const out = new Float32Array(4);
    const max = blendBeliefs([a, b], out);
    const tol = halfStep(0.7) + halfStep(0.65);
    expect(Math.abs(out[0] - 0.7)).toBeLessThanOrEqual(tol);
    expect(Math.abs(out[1] - 0.5)).toBeLessThanOrEqual(tol);
    expect(Math.abs(out[2] - 0.65)).toBeLessThanOrEqual(tol);
    expect(Math.abs(out[3] - 0.15)).toBeLessThanOrEqual(tol);
    expect(max).toBeCloseTo(0.7, 5);
    expect(out.reduce((s, v) => s + v, 0)).toBeCloseTo(2, 2);
  });

  it("clears stale values, skips a frame of another size and gives 0 for no robots", () => {
    const out = new Float32Array([9, 9, 9, 9]);
    const wrong = beliefFromWire(frameOf("c", 1, 2, [0.4, 0.6]), 1, 2)!;
    expect(blendBeliefs([wrong], out)).toBe(0);
    expect([...out]).toEqual([0, 0, 0, 0]);
  });
});

describe("beliefMasses", () => {
  it("writes one robot's masses and returns the largest", () => {
    const view = beliefFromWire(frameOf("d", 1, 3, [0.1, 0.6, 0.3]), 1, 3)!;
    const out = new Float32Array(3);
    expect(beliefMasses(view, out)).toBeCloseTo(0.6, 6);
    expect(Math.abs(out[0] - 0.1)).toBeLessThanOrEqual(halfStep(0.6) + 1e-7);
    expect(Math.abs(out[2] - 0.3)).toBeLessThanOrEqual(halfStep(0.6) + 1e-7);
  });
});
