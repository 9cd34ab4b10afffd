/**
 * One evaluation of the period map: the state after one period from x, and what it carried;
 * its derivative (when the map can give one) where `withJacobian` asks for it.
 */
export type PeriodMap<T> = (
  x: readonly number[],
  withJacobian: boolean,
) =>
  | {
      readonly ok: true;
      readonly end: readonly number[];
      readonly value: T;
      readonly jacobian?: readonly (readonly number[])[];
    }
  | { readonly ok: false; readonly reason: string };

export type ShootingOutcome<T> =
  | {
      readonly ok: true;
      readonly x: readonly number[];
      readonly value: T;
      readonly iterations: number;
      readonly periods: number;
      readonly residual: readonly number[];
    }
  | {
      readonly ok: false;
      readonly code: "load-collapse" | "no-periodic-steady-state";
      readonly reason: string;
      readonly periods: number;
    };

/**
 * Periodic steady state by shooting: the root of F(x) = P(x) − x, P the map over one period
 * (T. J. Aprille and T. N. Trick, "Steady-state analysis of nonlinear circuits with periodic
 * inputs", Proc. IEEE 60(1), 1972). Newton on J = ∂P/∂x − I: with the map's own derivative when
 * it returns one (the sensitivity of the integration, as Aprille and Trick), else a
 * finite-difference Jacobian and then Broyden's rank-one updates (one period per iteration). The
 * map's derivative is asked for at the start and after a fallback only: a Newton trial is often
 * the converged period, whose derivative would go unused, and otherwise the rank-one update of
 * the exact derivative carries on (C. G. Broyden, Math. Comp. 19, 1965). A step is accepted when it lowers max|F_j|/scale_j;
 * otherwise (also where the map fails or x[0] would turn non-positive) it is halved, and after
 * four halvings one period of the plain transient is taken instead, with a fresh Jacobian. The
 * fallback matters where F has a kink: a reservoir so large that a slightly higher start voltage
 * skips conduction altogether (F = −I·T/C above the fixed point, slope −1 below it). Converged when
 * |F_j| ≤ tol·scale_j for every component. For n ≤ 2 state variables.
 */
export function shootPeriodic<T>(
  map: PeriodMap<T>,
  x0: readonly number[],
  scale: readonly number[],
  tol: number,
  maxIter = 40,
): ShootingOutcome<T> {
  const n = x0.length;
  let periods = 0;
  const run = (x: readonly number[], withJacobian: boolean) => {
    periods += 1;
    return map(x, withJacobian);
  };
  let x = [...x0];
  const first = run(x, true);
  if (!first.ok) return { ok: false, code: "load-collapse", reason: first.reason, periods };
  let p: { readonly end: readonly number[]; readonly value: T; readonly jacobian?: readonly (readonly number[])[] } =
    first;
  let f = p.end.map((v, j) => v - (x[j] ?? 0));
  let jac: number[][] | undefined;
  for (let iter = 0; iter < maxIter; iter += 1) {
    if (f.every((v, j) => Math.abs(v) <= tol * (scale[j] ?? 1))) {
      return { ok: true, x, value: p.value, iterations: iter, periods, residual: f };
    }
    if (p.jacobian !== undefined) jac = p.jacobian.map((row, i) => row.map((v, j) => v - (i === j ? 1 : 0)));
    if (jac === undefined) {
      jac = [];
      for (let j = 0; j < n; j += 1) {
        const d = 1e-4 * (scale[j] ?? 1);
        const xp = x.map((v, k) => (k === j ? v - d : v));
        const q = run(xp, false);
        if (!q.ok) return { ok: false, code: "load-collapse", reason: q.reason, periods };
        for (let i = 0; i < n; i += 1) {
          const row = jac[i] ?? new Array<number>(n).fill(0);
          row[j] = -((q.end[i] ?? 0) - (xp[i] ?? 0) - (f[i] ?? 0)) / d;
          jac[i] = row;
        }
      }
    }
    // A singular Jacobian (a period without conduction maps x to x − I·T/C) falls back below.
    const step =
      solveSmall(
        jac,
        f.map((v) => -v),
      ) ?? [];
    let lambda = 1;
    let accepted = false;
    const norm = (g: readonly number[]): number => Math.max(...g.map((v, j) => Math.abs(v) / (scale[j] ?? 1)));
    for (let k = 0; k < 4 && step.length === n; k += 1) {
      const xn = x.map((v, j) => v + lambda * (step[j] ?? 0));
      if ((xn[0] ?? 0) > 0) {
        const q = run(xn, false);
        const fn = q.ok ? q.end.map((v, j) => v - (xn[j] ?? 0)) : [];
        if (q.ok && norm(fn) < norm(f)) {
          const dx = xn.map((v, j) => v - (x[j] ?? 0));
          const df = fn.map((v, j) => v - (f[j] ?? 0));
          broyden(jac, dx, df);
          x = xn;
          f = fn;
          p = q;
          accepted = true;
          break;
        }
      }
      lambda /= 2;
    }
    if (!accepted) {
      // Fall back to one period of the plain transient (always physical) and a fresh Jacobian.
      const xn: number[] = [...p.end];
      const q = (xn[0] ?? 0) > 0 ? run(xn, true) : undefined;
      if (q === undefined || !q.ok) {
        return {
          ok: false,
          code: "load-collapse",
          reason:
            "no periodic state with a positive reservoir voltage: the load draws more than the source can feed through the bridge",
          periods,
        };
      }
      x = xn;
      f = q.end.map((v: number, j: number) => v - (xn[j] ?? 0));
      p = q;
      jac = undefined;
    }
  }
  return {
    ok: false,
    code: "no-periodic-steady-state",
    reason: `the shooting iteration did not converge in ${maxIter} iterations`,
    periods,
  };
}

/**
 * One Newton step x0 − (∂P/∂x − I)⁻¹·(P(x0) − x0) on a (cheaper) map that returns its derivative:
 * a start for shootPeriodic, with what the map carried. x is absent when the map returns no
 * derivative, the step is singular or not finite, or x[0] would not stay positive; value is
 * absent when the map fails.
 */
export function newtonPredictor<T>(
  map: PeriodMap<T>,
  x0: readonly number[],
): { readonly x?: readonly number[]; readonly value?: T } {
  const p = map(x0, true);
  if (!p.ok) return {};
  if (p.jacobian === undefined) return { value: p.value };
  const jac = p.jacobian.map((row, i) => row.map((v, j) => v - (i === j ? 1 : 0)));
  const step = solveSmall(
    jac,
    p.end.map((v, j) => (x0[j] ?? 0) - v),
  );
  if (step === undefined || step.length !== x0.length) return { value: p.value };
  const x = x0.map((v, j) => v + (step[j] ?? 0));
  return x.every(Number.isFinite) && (x[0] ?? 0) > 0 ? { x, value: p.value } : { value: p.value };
}

/** Good Broyden update J += (ΔF − J·Δx)·Δxᵀ / (Δxᵀ·Δx). */
function broyden(jac: number[][], dx: readonly number[], df: readonly number[]): void {
  const dd = dx.reduce((s, v) => s + v * v, 0);
  if (!(dd > 0)) return;
  for (let i = 0; i < jac.length; i += 1) {
    const row = jac[i];
    if (row === undefined) continue;
    const jdx = row.reduce((s, v, j) => s + v * (dx[j] ?? 0), 0);
    const u = ((df[i] ?? 0) - jdx) / dd;
    for (let j = 0; j < row.length; j += 1) row[j] = (row[j] ?? 0) + u * (dx[j] ?? 0);
  }
}

/** Solve a 1×1 or 2×2 system by Cramer's rule; undefined when singular. */
function solveSmall(a: readonly (readonly number[])[], b: readonly number[]): number[] | undefined {
  if (b.length === 1) {
    const a00 = a[0]?.[0] ?? 0;
    return a00 !== 0 ? [(b[0] ?? 0) / a00] : undefined;
  }
  const a00 = a[0]?.[0] ?? 0;
  const a01 = a[0]?.[1] ?? 0;
  const a10 = a[1]?.[0] ?? 0;
  const a11 = a[1]?.[1] ?? 0;
  const det = a00 * a11 - a01 * a10;
  if (!(Math.abs(det) > 0)) return undefined;
  const b0 = b[0] ?? 0;
  const b1 = b[1] ?? 0;
  return [(b0 * a11 - a01 * b1) / det, (a00 * b1 - b0 * a10) / det];
}
