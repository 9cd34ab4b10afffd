import { describe, expect, it } from "vitest";
import { bracketedRoot } from "../../../domain/solve/root-find.js";
import { thermalFixedPoint } from "../../../domain/solve/thermal-fixed-point.js";

/** Reference root by bisection to the last bit (independent of the method under test). */
function bisect(f: (x: number) => number, a: number, b: number): number {
  let fa = f(a);
  for (let i = 0; i < 200; i += 1) {
    const m = 0.5 * (a + b);
    if (m === a || m === b) return m;
    const fm = f(m);
    if (fm === 0) return m;
    if (fm * fa > 0) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return 0.5 * (a + b);
}

describe("bracketedRoot with the secant stopping test (stepTolX)", () => {
  const cases: { name: string; f: (x: number) => number; a: number; b: number }[] = [
    { name: "cos x − x", f: (x) => Math.cos(x) - x, a: 0, b: 1 },
    { name: "x³ − 2x − 5 (Wallis' cubic)", f: (x) => x ** 3 - 2 * x - 5, a: 2, b: 3 },
    { name: "e^x − 10 (curved, one-sided regula falsi)", f: (x) => Math.exp(x) - 10, a: 0, b: 4 },
  ];
  for (const c of cases) {
    it(`${c.name}: within the tolerance of the bisection root, in no more iterations than the bracket test alone`, () => {
      const ref = bisect(c.f, c.a, c.b);
      const tol = 1e-10;
      const plain = bracketedRoot(c.f, c.a, c.b, c.f(c.a), c.f(c.b), tol);
      const withStep = bracketedRoot(c.f, c.a, c.b, c.f(c.a), c.f(c.b), tol, 200, tol);
      expect(Math.abs(withStep.x - ref)).toBeLessThan(tol);
      expect(Math.abs(plain.x - ref)).toBeLessThan(tol);
      expect(withStep.iterations).toBeLessThanOrEqual(plain.iterations);
    });
  }
});

describe("thermalFixedPoint: the lowest root of Tj = Ta + Rth·P(Tj)", () => {
  // Closed form: with P(T) = P0·(1 + α·(T − Ta)), Tj − Ta = Rth·P(Tj) gives
  // Tj − Ta = Rth·P0/(1 − Rth·P0·α) for Rth·P0·α < 1, and the loop gain Rth·dP/dT = Rth·P0·α.
  it("linear loss: the closed form to 1e-11 K, with the loop gain Rth·P0·α", () => {
    const taC = 40;
    const taK = taC + 273.15;
    for (const [rth, p0, alpha] of [
      [20, 2, 0.004],
      [50, 1.5, 0.01],
      [5, 0.3, -0.002],
    ] as const) {
      const r = thermalFixedPoint(taC, rth, 500, (tK) => ({ ok: true as const, lossW: p0 * (1 + alpha * (tK - taK)) }));
      if (r.kind !== "root") throw new Error(r.kind);
      const exact = taK + (rth * p0) / (1 - rth * p0 * alpha);
      expect(Math.abs(r.tjK - exact)).toBeLessThan(1e-11);
      expect(Math.abs((r.loopGain ?? Number.NaN) - rth * p0 * alpha)).toBeLessThan(1e-9);
    }
  });

  it("quadratic loss P0·(1 + α·ΔT)²: the smaller root of the quadratic (the stable one), to 1e-11 K", () => {
    // u = Tj − Ta solves k·α²·u² + (2kα − 1)·u + k = 0 with k = Rth·P0; the lower root is stable.
    const taC = 25;
    const taK = taC + 273.15;
    const rth = 30;
    const p0 = 1;
    const alpha = 0.004;
    const k = rth * p0;
    const A = k * alpha * alpha;
    const B = 2 * k * alpha - 1;
    const u = (-B - Math.sqrt(B * B - 4 * A * k)) / (2 * A);
    const r = thermalFixedPoint(taC, rth, 400, (tK) => ({
      ok: true as const,
      lossW: p0 * (1 + alpha * (tK - taK)) ** 2,
    }));
    if (r.kind !== "root") throw new Error(r.kind);
    expect(Math.abs(r.tjK - (taK + u))).toBeLessThan(1e-11);
    // a regression guard on the search's cost: start, fixed-point step, secant steps, gain probe
    expect(r.evaluations).toBeLessThanOrEqual(7); // 9 before the secant stopping test
  });
});
