import { describe, expect, it } from "vitest";
import { bicycleDrive, bicycleDriveCg, differentialDrive, integrateArc } from "./drive";

describe("differentialDrive", () => {
  it("matches the textbook wheel-speed formulas", () => {
    // CHECKS.md (differential drive): vl 0.4, vr 0.6, b 0.5 → v 0.5 m/s, ω 0.4 rad/s, R 1.25 m.
    const body = differentialDrive({ vl: 0.4, vr: 0.6, track: 0.5 });
    expect(body.v).toBeCloseTo(0.5, 12);
    expect(body.omega).toBeCloseTo(0.4, 12);
    expect(body.radius).toBeCloseTo(1.25, 12);
  });

  it("turns clockwise with a negative radius when the left wheel is faster", () => {
    const body = differentialDrive({ vl: 0.9, vr: 0.3, track: 0.4 });
    expect(body.v).toBeCloseTo(0.6, 12);
    expect(body.omega).toBeCloseTo(-1.5, 12);
    expect(body.radius).toBeCloseTo(-0.4, 12);
  });

  it("reports a straight line as radius null and a spin on the spot as radius 0", () => {
    expect(differentialDrive({ vl: 0.35, vr: 0.35, track: 0.3 })).toEqual({ v: 0.35, omega: 0, radius: null });
    const spin = differentialDrive({ vl: -0.2, vr: 0.2, track: 0.5 });
    expect(spin.radius).toBe(0);
    expect(spin.omega).toBeCloseTo(0.8, 12);
  });
});

describe("bicycleDrive", () => {
  it("matches the rear-axle kinematic bicycle", () => {
    // CHECKS.md (kinematic bicycle): L 2.5, δ 0.2 rad, v 10 → R 12.3329 m, θ̇ 0.81084 rad/s.
    const body = bicycleDrive({ v: 10, steer: 0.2, wheelbase: 2.5 });
    expect(body.radius).toBeCloseTo(12.3329, 4);
    expect(body.omega).toBeCloseTo(0.81084, 5);
    expect(body.v).toBe(10);
  });

  it("matches the centre-of-gravity variant", () => {
    // CHECKS.md (CG reference): l_r 1.2 → β 0.096995 rad, θ̇ 0.807029 rad/s.
    const body = bicycleDriveCg({ v: 10, steer: 0.2, wheelbase: 2.5, lr: 1.2 });
    expect(body.beta).toBeCloseTo(0.096995, 6);
    expect(body.omega).toBeCloseTo(0.807029, 6);
    expect(body.radius).toBeCloseTo(10 / 0.807029, 3);
  });

  it("reports straight ahead as radius null and rejects a steer of π/2", () => {
    expect(bicycleDrive({ v: 3, steer: 0, wheelbase: 1.1 }).radius).toBeNull();
    expect(() => bicycleDrive({ v: 3, steer: Math.PI / 2, wheelbase: 1.1 })).toThrow(RangeError);
  });
});

describe("integrateArc", () => {
  it("comes back to the start after one full turn of a differential drive", () => {
    // CHECKS.md: with constant controls the pose lies on the circle; one full turn returns to the start.
    const body = differentialDrive({ vl: 0.4, vr: 0.6, track: 0.5 });
    const start = { x: 1.5, y: -0.75, theta: 0.3 };
    const end = integrateArc(start, body.v, body.omega, (2 * Math.PI) / body.omega);
    expect(end.x).toBeCloseTo(start.x, 9);
    expect(end.y).toBeCloseTo(start.y, 9);
    expect(end.theta).toBeCloseTo(start.theta, 9);
  });

  it("comes back to the start after one full turn of a bicycle", () => {
    const body = bicycleDrive({ v: 10, steer: 0.2, wheelbase: 2.5 });
    const start = { x: -4, y: 2.5, theta: -2.1 };
    const end = integrateArc(start, body.v, body.omega, (2 * Math.PI) / body.omega);
    expect(end.x).toBeCloseTo(start.x, 8);
    expect(end.y).toBeCloseTo(start.y, 8);
    expect(end.theta).toBeCloseTo(start.theta, 9);
  });

  it("lands on the circle of radius v/ω after a quarter turn", () => {
    // Heading 0 at the origin, turning left with R = 1.25: centre (0, 1.25), quarter turn ends at (1.25, 1.25), heading π/2.
    const end = integrateArc({ x: 0, y: 0, theta: 0 }, 0.5, 0.4, Math.PI / 2 / 0.4);
    expect(end.x).toBeCloseTo(1.25, 12);
    expect(end.y).toBeCloseTo(1.25, 12);
    expect(end.theta).toBeCloseTo(Math.PI / 2, 12);
  });

  it("moves in a straight line for ω = 0 and stays finite for tiny ω", () => {
    const straight = integrateArc({ x: 1, y: 2, theta: Math.PI / 6 }, 0.8, 0, 2.5);
    expect(straight.x).toBeCloseTo(1 + 2 * Math.cos(Math.PI / 6), 12);
    expect(straight.y).toBeCloseTo(2 + 2 * Math.sin(Math.PI / 6), 12);
    const nearly = integrateArc({ x: 1, y: 2, theta: Math.PI / 6 }, 0.8, 1e-14, 2.5);
    expect(nearly.x).toBeCloseTo(straight.x, 12);
    expect(nearly.y).toBeCloseTo(straight.y, 12);
  });

  it("turns on the spot when v = 0 and wraps theta into (−π, π]", () => {
    const end = integrateArc({ x: 0.2, y: 0.3, theta: 3 }, 0, 1, 0.5);
    expect(end.x).toBe(0.2);
    expect(end.y).toBe(0.3);
    expect(end.theta).toBeCloseTo(3.5 - 2 * Math.PI, 12);
  });
});
