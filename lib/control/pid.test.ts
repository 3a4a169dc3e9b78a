import { describe, expect, it } from "vitest";
import { createPid, wrapDegrees, wrapRadians, zieglerNichols } from "./pid";

describe("zieglerNichols", () => {
  it("gives the ultimate-gain table's gains", () => {
    // Ziegler and Nichols (1942), table as in CHECKS.md: Ku 10, Tu 2 s → PID Kp 6, Ki 6, Kd 1.5.
    const pid = zieglerNichols(10, 2, "PID");
    expect(pid.kp).toBeCloseTo(6, 12);
    expect(pid.ki).toBeCloseTo(6, 12);
    expect(pid.kd).toBeCloseTo(1.5, 12);
    // Same table: P Kp 0.5 Ku; PI Kp 0.45 Ku, Ti Tu/1.2 → Ki 0.54 Ku/Tu. Ku 8, Tu 3 chosen asymmetric.
    expect(zieglerNichols(8, 3, "P")).toEqual({ kp: 4, ki: 0, kd: 0 });
    const pi = zieglerNichols(8, 3, "PI");
    expect(pi.kp).toBeCloseTo(3.6, 12);
    expect(pi.ki).toBeCloseTo(1.44, 12);
    expect(pi.kd).toBe(0);
  });

  it("rejects non-positive ultimate gain or period", () => {
    expect(() => zieglerNichols(0, 2, "PID")).toThrow(RangeError);
    expect(() => zieglerNichols(10, -1, "PI")).toThrow(RangeError);
  });
});

describe("createPid closed loops", () => {
  it("P control of a first-order plant settles at K·Kp/(1 + K·Kp)", () => {
    // CHECKS.md (final-value theorem, standard result): plant K/(τs+1) with zero-order hold,
    // y[k+1] = a·y[k] + K(1−a)·u[k], a = e^(−T/τ); K 2, Kp 3, τ 1, T 0.1 → y settles at 6/7.
    const plantGain = 2;
    const tauS = 1;
    const dtS = 0.1;
    const a = Math.exp(-dtS / tauS);
    const pid = createPid({ kp: 3, ki: 0, kd: 0 });
    let y = 0;
    for (let k = 0; k < 400; k++) y = a * y + plantGain * (1 - a) * pid.step(1 - y, dtS);
    expect(y).toBeCloseTo(6 / 7, 9);
  });

  it("drives a heading integrator with error (1 − Kp·T)^k", () => {
    // CHECKS.md: θ[k+1] = θ[k] + T·Kp·(r − θ[k]); Kp 2, T 0.1, r 1 → θ 0.2, 0.36, 0.488
    // after 1, 2, 3 steps (errors 0.8, 0.64, 0.512).
    const pid = createPid({ kp: 2, ki: 0, kd: 0 });
    const dtS = 0.1;
    let theta = 0;
    const thetas: number[] = [];
    for (let k = 0; k < 3; k++) {
      theta += dtS * pid.step(wrapDegrees(1 - theta), dtS);
      thetas.push(theta);
    }
    expect(thetas[0]).toBeCloseTo(0.2, 12);
    expect(thetas[1]).toBeCloseTo(0.36, 12);
    expect(thetas[2]).toBeCloseTo(0.488, 12);
    expect(1 - thetas[2]).toBeCloseTo(0.512, 12);
  });

  it("removes the steady-state error of the first-order plant once integral action is added", () => {
    // Final-value theorem (standard result, from memory): an integrator in the loop gives zero steady-state step error.
    const a = Math.exp(-0.1);
    const pid = createPid({ kp: 3, ki: 1.5, kd: 0 });
    let y = 0;
    for (let k = 0; k < 2000; k++) y = a * y + 2 * (1 - a) * pid.step(1 - y, 0.1);
    expect(y).toBeCloseTo(1, 6);
  });
});

describe("createPid terms and limits", () => {
  it("sums P, I (backward Euler) and D (backward difference) with distinct gains", () => {
    const pid = createPid({ kp: 2, ki: 0.5, kd: 0.25 });
    // step 1: no derivative history → 2·1 + 0.5·(1·0.2) = 2.1
    expect(pid.step(1, 0.2)).toBeCloseTo(2.1, 12);
    // step 2: e 3 → 2·3 + 0.5·(0.2 + 0.6) + 0.25·(3 − 1)/0.2 = 6 + 0.4 + 2.5 = 8.9
    expect(pid.step(3, 0.2)).toBeCloseTo(8.9, 12);
  });

  it("takes the derivative on the measurement when one is given", () => {
    const pid = createPid({ kp: 0, ki: 0, kd: 0.5 });
    pid.step(1, 0.1, 4);
    // A set-point jump changes the error but not the measurement: no derivative kick.
    expect(pid.step(7, 0.1, 4)).toBeCloseTo(0, 12);
    // Measurement rising 4 → 4.3 in 0.1 s gives −0.5·3 = −1.5.
    expect(pid.step(6.7, 0.1, 4.3)).toBeCloseTo(-1.5, 12);
  });

  it("clamps the output to its limits", () => {
    const pid = createPid({ kp: 10, ki: 0, kd: 0, outMin: -2, outMax: 3 });
    expect(pid.step(1, 0.1)).toBe(3);
    expect(pid.step(-1, 0.1)).toBe(-2);
    expect(pid.step(0.25, 0.1)).toBeCloseTo(2.5, 12);
  });

  it("does not wind up the integral while saturated", () => {
    const limited = createPid({ kp: 1, ki: 2, kd: 0, outMax: 1.5, outMin: -1.5 });
    for (let k = 0; k < 100; k++) limited.step(2, 0.1);
    // The integral froze near where the output first saturated; a reversed error brings the
    // output out of saturation at once instead of after unwinding 100 steps of integral.
    const after = limited.step(-1, 0.1);
    expect(after).toBeLessThan(1.5);
    expect(after).toBeGreaterThan(-1.5);
    expect(after).toBeCloseTo(-1 + 2 * (0 - 0.1), 9);
  });

  it("reset forgets the integral and the derivative history", () => {
    const pid = createPid({ kp: 1, ki: 1, kd: 1 });
    pid.step(5, 0.5);
    pid.step(2, 0.5);
    pid.reset();
    expect(pid.step(1, 0.5)).toBeCloseTo(1 + 0.5, 12);
  });

  it("applies only P and the stored integral on a zero time step", () => {
    const pid = createPid({ kp: 2, ki: 4, kd: 3 });
    pid.step(1, 0.25);
    expect(pid.step(0.5, 0)).toBeCloseTo(2 * 0.5 + 4 * 0.25, 12);
  });

  it("throws on non-finite inputs (programmer error)", () => {
    const pid = createPid({ kp: 1, ki: 0, kd: 0 });
    expect(() => pid.step(Number.NaN, 0.1)).toThrow(RangeError);
    expect(() => createPid({ kp: 1, ki: 0, kd: 0, outMin: 2, outMax: 1 })).toThrow(RangeError);
  });
});

describe("wrapDegrees / wrapRadians", () => {
  it("wraps into (−180, 180]", () => {
    expect(wrapDegrees(190)).toBeCloseTo(-170, 12);
    expect(wrapDegrees(-190)).toBeCloseTo(170, 12);
    expect(wrapDegrees(180)).toBe(180);
    expect(wrapDegrees(-180)).toBe(180);
    expect(wrapDegrees(540)).toBe(180);
    expect(wrapDegrees(725)).toBeCloseTo(5, 12);
    expect(wrapDegrees(-37)).toBe(-37);
  });

  it("wraps radians into (−π, π]", () => {
    expect(wrapRadians(-Math.PI)).toBeCloseTo(Math.PI, 12);
    expect(wrapRadians(3 * Math.PI + 0.1)).toBeCloseTo(-Math.PI + 0.1, 12);
    expect(wrapRadians(0.7)).toBe(0.7);
  });
});
