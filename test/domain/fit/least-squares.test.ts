import { describe, expect, it } from "vitest";
import { leastSquares } from "../../../domain/fit/least-squares.js";
import { createRng } from "../../../domain/solve/prng.js";

const rng = createRng(42);
const xs = Array.from({ length: 15 }, (_, i) => i * 0.5);
const ys = xs.map((x) => 1.5 + 0.8 * x + 0.1 * rng.normal());
const line = (u: readonly number[]) => xs.map((x, i) => (u[0] ?? 0) + (u[1] ?? 0) * x - (ys[i] ?? 0));
const free = [Number.NEGATIVE_INFINITY, Number.NEGATIVE_INFINITY];
const none = [Number.POSITIVE_INFINITY, Number.POSITIVE_INFINITY];

describe("bounded nonlinear least squares (the fitting core)", () => {
  // Closed form: ordinary least squares of a straight line, b = Sxy/Sxx, a = ȳ − b·x̄, and the
  // textbook standard errors se(b) = s/√Sxx, se(a) = s·√(1/m + x̄²/Sxx), s² = SSR/(m − 2).
  const m = xs.length;
  const xBar = xs.reduce((s, x) => s + x, 0) / m;
  const yBar = ys.reduce((s, y) => s + y, 0) / m;
  const sxx = xs.reduce((s, x) => s + (x - xBar) ** 2, 0);
  const sxy = xs.reduce((s, x, i) => s + (x - xBar) * ((ys[i] ?? 0) - yBar), 0);
  const b = sxy / sxx;
  const a = yBar - b * xBar;
  const ssr = xs.reduce((s, x, i) => s + (a + b * x - (ys[i] ?? 0)) ** 2, 0);
  const s = Math.sqrt(ssr / (m - 2));

  it("finds the closed-form straight line and its standard errors", () => {
    const r = leastSquares({ residuals: line, start: [0, 0], lower: free, upper: none });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    expect(r.method).toBe("levenberg-marquardt");
    expect(r.converged).toBe(true);
    expect(Math.abs((r.params[0] ?? 0) - a)).toBeLessThan(1e-9);
    expect(Math.abs((r.params[1] ?? 0) - b)).toBeLessThan(1e-9);
    expect(Math.abs(r.sumSquares - ssr) / ssr).toBeLessThan(1e-9);
    expect(Math.abs((r.standardErrors[1] ?? 0) - s / Math.sqrt(sxx)) / (s / Math.sqrt(sxx))).toBeLessThan(1e-5);
    expect(Math.abs((r.standardErrors[0] ?? 0) - s * Math.sqrt(1 / m + (xBar * xBar) / sxx)) / s).toBeLessThan(1e-5);
  });

  it("holds a parameter on its bound and fits the rest (closed form: a = ȳ − b_max·x̄)", () => {
    const bMax = b - 0.2;
    const r = leastSquares({ residuals: line, start: [0, 0], lower: free, upper: [Number.POSITIVE_INFINITY, bMax] });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    expect(r.params[1]).toBe(bMax);
    expect(r.atBound).toEqual([false, true]);
    expect(Math.abs((r.params[0] ?? 0) - (yBar - bMax * xBar))).toBeLessThan(1e-9);
    expect(r.standardErrors[1]).toBeUndefined();
  });

  it("is deterministic: the same problem gives the same bits", () => {
    const p = {
      residuals: (u: readonly number[]) =>
        xs.map((x, i) => (u[0] ?? 0) * Math.exp(-(u[1] ?? 0) * x) - (ys[i] ?? 0) / 10),
      start: [1, 0.1],
      lower: free,
      upper: none,
    };
    expect(JSON.stringify(leastSquares(p))).toBe(JSON.stringify(leastSquares(p)));
  });

  it("solves a square system exactly by Newton (Rosenbrock's root at (1, 1))", () => {
    const r = leastSquares({
      residuals: (u) => [10 * ((u[1] ?? 0) - (u[0] ?? 0) ** 2), 1 - (u[0] ?? 0)],
      start: [-1.2, 1],
      lower: free,
      upper: none,
    });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    expect(r.method).toBe("newton");
    expect(Math.abs((r.params[0] ?? 0) - 1)).toBeLessThan(1e-9);
    expect(Math.abs((r.params[1] ?? 0) - 1)).toBeLessThan(1e-9);
  });

  it("minimises Rosenbrock's function as least squares with a third, redundant residual", () => {
    // Minimum of 100(y − x²)² + (1 − x)² + (0.01·(x − 1))² is (1, 1) exactly.
    const r = leastSquares({
      residuals: (u) => [10 * ((u[1] ?? 0) - (u[0] ?? 0) ** 2), 1 - (u[0] ?? 0), 0.01 * ((u[0] ?? 0) - 1)],
      start: [-1.2, 1],
      lower: free,
      upper: none,
    });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    expect(Math.abs((r.params[0] ?? 0) - 1)).toBeLessThan(1e-6);
    expect(Math.abs((r.params[1] ?? 0) - 1)).toBeLessThan(1e-6);
  });

  it("says when it stopped at its iteration cap, not converged (Rosenbrock's valley from (−1.2, 1) takes more than 5 steps)", () => {
    const rosenbrock = (u: readonly number[]) => [
      10 * ((u[1] ?? 0) - (u[0] ?? 0) ** 2),
      1 - (u[0] ?? 0),
      0.01 * ((u[0] ?? 0) - 1),
    ];
    const capped = leastSquares({
      residuals: rosenbrock,
      start: [-1.2, 1],
      lower: free,
      upper: none,
      maxIterations: 5,
    });
    if (capped.outcome !== "solved") throw new Error(capped.outcome);
    expect(capped.converged).toBe(false);
    expect(capped.iterations).toBe(5);
    const free_ = leastSquares({ residuals: rosenbrock, start: [-1.2, 1], lower: free, upper: none });
    if (free_.outcome !== "solved") throw new Error(free_.outcome);
    expect(free_.converged).toBe(true);
    expect(free_.iterations).toBeLessThan(500);
  });

  it("an exact (square) system that stalls before its cap is not converged, and says where it stalled", () => {
    // r(u) = |u| + 1 has no root: Newton from u = 2 reaches u = 0, where |r| = 1 is the least the
    // residual can be, so no halved step lowers it (hand-traced: two accepted steps, then the stall).
    const r = leastSquares({ residuals: (u) => [Math.abs(u[0] ?? 0) + 1], start: [2], lower: [-10], upper: [10] });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    expect(r.method).toBe("newton");
    expect(r.iterations).toBeLessThan(200);
    expect(r.converged).toBe(false);
    expect(r.stopReason).toMatch(/stalled after \d+ iterations: .*residual norm 1\.000e\+0 .*at most 1e-12/);
    // The same law with a root (r = u − 1) converges, and says no reason.
    const root = leastSquares({ residuals: (u) => [(u[0] ?? 0) - 1], start: [2], lower: [-10], upper: [10] });
    if (root.outcome !== "solved") throw new Error(root.outcome);
    expect(root.converged).toBe(true);
    expect(root.stopReason).toBeUndefined();
    // At the cap: the cap's reason.
    const capped = leastSquares({
      residuals: (u) => [(u[0] ?? 0) ** 3 - 8],
      start: [100],
      lower: [-1e3],
      upper: [1e3],
      maxIterations: 2,
    });
    if (capped.outcome !== "solved") throw new Error(capped.outcome);
    expect(capped.converged).toBe(false);
    expect(capped.stopReason).toBe("the solver stopped at its iteration cap (2 iterations) before converging");
  });

  it("refuses fewer points than parameters, and a model not finite at the start", () => {
    expect(leastSquares({ residuals: () => [1], start: [0, 0], lower: free, upper: none }).outcome).toBe("singular");
    expect(leastSquares({ residuals: () => [Number.NaN, 1, 2], start: [0, 0], lower: free, upper: none }).outcome).toBe(
      "non-finite",
    );
  });
});
