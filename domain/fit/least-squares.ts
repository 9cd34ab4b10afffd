import { invertMatrix, solveLinear } from "./linear-solve.js";

/**
 * Bounded nonlinear least squares: minimise Σ rᵢ(u)² over lower ≤ u ≤ upper.
 *
 * - More residuals than parameters: Levenberg–Marquardt with Marquardt's diagonal scaling
 *   (K. Levenberg 1944; D. W. Marquardt, J. SIAM 11(2), 1963) and Nielsen's damping update
 *   (H. B. Nielsen, "Damping parameter in Marquardt's method", IMM DTU, 1999; K. Madsen,
 *   H. B. Nielsen, O. Tingleff, "Methods for non-linear least squares problems", 2004, §3.2),
 *   μ ← μ·max(1/3, 1 − (2ρ − 1)³) on success and μ ← μ·ν, ν ← 2ν on failure. Bounds by
 *   projection with an active set: a parameter on a bound whose gradient points outwards is
 *   held for that step, every trial point is clipped into the box.
 * - As many residuals as parameters (the points determine the parameters exactly): the least-
 *   squares minimum is a root of r, found by Newton's method with step halving, the bounds
 *   acting as strict feasibility limits on the trial points. This is the solver the diode's
 *   two- and three-point fit has always used, kept step for step so its answers stay the same.
 *
 * Jacobians by forward differences, hⱼ = 10⁻⁷·max(1, |uⱼ|) (stepping back inside an upper bound).
 * Deterministic: no randomness, a fixed order of operations.
 *
 * Uncertainty (over-determined case only): covariance = s²·(JᵀJ)⁻¹ at the solution over the
 * parameters off their bounds, s² = Σr²/(m − n_free) (the usual linearised estimate, e.g. Press
 * et al., Numerical Recipes, §15.4-15.5); standard errors are the square roots of its diagonal.
 */
export interface LeastSquaresProblem {
  /** Residuals at parameters u (weighted as the fit wants them compared). */
  readonly residuals: (u: readonly number[]) => readonly number[];
  readonly start: readonly number[];
  /** Per-parameter bounds; −Infinity / Infinity where free. */
  readonly lower: readonly number[];
  readonly upper: readonly number[];
  readonly maxIterations?: number;
}

export type LeastSquaresResult =
  | {
      readonly outcome: "solved";
      readonly method: "newton" | "levenberg-marquardt";
      readonly params: readonly number[];
      readonly residuals: readonly number[];
      readonly sumSquares: number;
      readonly iterations: number;
      /** True only when the convergence test passed; false when the iteration cap or a stall stopped it. */
      readonly converged: boolean;
      /** Why it stopped before converging (the cap, or a stall and where); absent when converged. */
      readonly stopReason?: string;
      /** Standard error of each parameter; undefined on a bound, or with no degrees of freedom left. */
      readonly standardErrors: readonly (number | undefined)[];
      /** Which parameters ended on a bound (Levenberg–Marquardt only). */
      readonly atBound: readonly boolean[];
    }
  | { readonly outcome: "singular"; readonly reason: string }
  | { readonly outcome: "non-finite"; readonly reason: string };

/** The reason a run that reached its cap gives. */
export const iterationCapReason = (iterations: number): string =>
  `the solver stopped at its iteration cap (${iterations} iterations) before converging`;

/** `converged`, and the reason when not: the cap when it was reached, else the stall's own words. */
const runEnd = (
  converged: boolean,
  iterations: number,
  cap: number,
  stall: string,
): { converged: boolean; stopReason?: string } =>
  converged ? { converged } : { converged, stopReason: iterations >= cap ? iterationCapReason(iterations) : stall };

export function leastSquares(p: LeastSquaresProblem): LeastSquaresResult {
  const r0 = p.residuals(p.start);
  if (r0.length === p.start.length) return newtonRoot(p, r0);
  if (r0.length < p.start.length)
    return { outcome: "singular", reason: `${r0.length} points cannot determine ${p.start.length} parameters` };
  return levenbergMarquardt(p);
}

function forwardJacobian(p: LeastSquaresProblem, u: readonly number[], r: readonly number[]): number[][] {
  const jac: number[][] = r.map(() => new Array<number>(u.length).fill(0));
  for (let j = 0; j < u.length; j += 1) {
    const uj = u[j] ?? 0;
    let h = 1e-7 * Math.max(1, Math.abs(uj));
    if (uj + h > (p.upper[j] ?? Number.POSITIVE_INFINITY)) h = -h;
    const up = [...u];
    up[j] = uj + h;
    const rp = p.residuals(up);
    for (let i = 0; i < r.length; i += 1) {
      const row = jac[i];
      if (row) row[j] = ((rp[i] ?? 0) - (r[i] ?? 0)) / h;
    }
  }
  return jac;
}

function newtonRoot(p: LeastSquaresProblem, r0: readonly number[]): LeastSquaresResult {
  const u = [...p.start];
  const dim = u.length;
  const feasible = (t: readonly number[]) =>
    t.every((v, j) => v > (p.lower[j] ?? Number.NEGATIVE_INFINITY) && v < (p.upper[j] ?? Number.POSITIVE_INFINITY));
  let r = r0;
  let norm = Math.hypot(...r);
  let iter = 0;
  const cap = p.maxIterations ?? 200;
  // The convergence test: the residual norm at or below 1e-12 (the points are met exactly).
  for (; iter < cap && norm > 1e-12; iter += 1) {
    const jac = forwardJacobian(p, u, r);
    const step = solveLinear(
      jac,
      r.map((v) => -v),
    );
    if (step === undefined) return { outcome: "singular", reason: "the points are degenerate (singular fit)" };
    let lambda = 1;
    let accepted = false;
    while (lambda > 1e-6) {
      const trial = u.map((v, j) => v + lambda * (step[j] ?? 0));
      if (feasible(trial)) {
        const rt = p.residuals(trial);
        const nt = Math.hypot(...rt);
        if (Number.isFinite(nt) && nt < norm) {
          for (let j = 0; j < dim; j += 1) u[j] = trial[j] ?? 0;
          r = rt;
          norm = nt;
          accepted = true;
          break;
        }
      }
      lambda /= 2;
    }
    if (!accepted) break;
  }
  if (!Number.isFinite(norm))
    return { outcome: "non-finite", reason: "the model gives no finite value at the starting point" };
  return {
    outcome: "solved",
    method: "newton",
    params: u,
    residuals: r,
    sumSquares: norm * norm,
    iterations: iter,
    ...runEnd(
      norm <= 1e-12,
      iter,
      cap,
      `the solver stalled after ${iter} iterations: no step along the Newton direction (halved down to 1e-6 of it) ` +
        `lowers the residual norm ${norm.toExponential(3)} towards the convergence test (at most 1e-12)`,
    ),
    standardErrors: u.map(() => undefined),
    atBound: u.map(() => false),
  };
}

const sumSq = (r: readonly number[]) => r.reduce((s, v) => s + v * v, 0);

function levenbergMarquardt(p: LeastSquaresProblem): LeastSquaresResult {
  const n = p.start.length;
  const lo = (j: number) => p.lower[j] ?? Number.NEGATIVE_INFINITY;
  const hi = (j: number) => p.upper[j] ?? Number.POSITIVE_INFINITY;
  const clip = (v: number, j: number) => Math.min(hi(j), Math.max(lo(j), v));
  let u = p.start.map(clip);
  let r = p.residuals(u);
  let ssr = sumSq(r);
  if (!Number.isFinite(ssr))
    return { outcome: "non-finite", reason: "the model gives no finite value at the starting point" };
  let jac = forwardJacobian(p, u, r);
  const normal = (jm: readonly number[][], rv: readonly number[]) => {
    const a = Array.from({ length: n }, () => new Array<number>(n).fill(0));
    const g = new Array<number>(n).fill(0);
    jm.forEach((row, i) => {
      for (let j = 0; j < n; j += 1) {
        g[j] = (g[j] ?? 0) + (row[j] ?? 0) * (rv[i] ?? 0);
        const aj = a[j];
        if (aj) for (let k = 0; k < n; k += 1) aj[k] = (aj[k] ?? 0) + (row[j] ?? 0) * (row[k] ?? 0);
      }
    });
    return { a, g };
  };
  let { a, g } = normal(jac, r);
  const diagOf = (m: readonly number[][]) => m.map((row, j) => Math.max(row[j] ?? 0, 1e-300));
  let mu = 1e-3 * Math.max(...diagOf(a));
  let nu = 2;
  const maxIter = p.maxIterations ?? 500;
  let iter = 0;
  let converged = false;
  while (iter < maxIter) {
    iter += 1;
    if (ssr === 0) {
      converged = true;
      break;
    }
    const free = u.map((v, j) => !((v <= lo(j) && (g[j] ?? 0) > 0) || (v >= hi(j) && (g[j] ?? 0) < 0)));
    const idx = free.flatMap((f, j) => (f ? [j] : []));
    if (idx.length === 0) {
      converged = true;
      break;
    }
    const d = diagOf(a);
    const sys = idx.map((j) => idx.map((k) => (a[j]?.[k] ?? 0) + (j === k ? mu * (d[j] ?? 1) : 0)));
    const sol = solveLinear(
      sys,
      idx.map((j) => -(g[j] ?? 0)),
    );
    if (sol === undefined) {
      mu *= nu;
      nu *= 2;
      if (!Number.isFinite(mu)) break;
      continue;
    }
    const trial = [...u];
    idx.forEach((j, k) => {
      trial[j] = clip((u[j] ?? 0) + (sol[k] ?? 0), j);
    });
    const dp = trial.map((v, j) => v - (u[j] ?? 0));
    const stepNorm = Math.hypot(...dp);
    if (stepNorm <= 1e-15 * (Math.hypot(...u) + 1e-15)) {
      converged = true;
      break;
    }
    const rt = p.residuals(trial);
    const st = sumSq(rt);
    let adp = 0;
    let gdp = 0;
    for (let j = 0; j < n; j += 1) {
      gdp += (g[j] ?? 0) * (dp[j] ?? 0);
      for (let k = 0; k < n; k += 1) adp += (dp[j] ?? 0) * (a[j]?.[k] ?? 0) * (dp[k] ?? 0);
    }
    const predicted = -2 * gdp - adp;
    if (Number.isFinite(st) && st < ssr) {
      const rho = predicted > 0 ? (ssr - st) / predicted : 1;
      const relative = (ssr - st) / ssr;
      u = trial;
      r = rt;
      ssr = st;
      jac = forwardJacobian(p, u, r);
      ({ a, g } = normal(jac, r));
      mu *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
      nu = 2;
      if (relative < 1e-14) {
        converged = true;
        break;
      }
    } else {
      mu *= nu;
      nu *= 2;
      // No decrease is possible any more along any damped step: the minimum to rounding.
      if (!(mu < 1e30 * Math.max(...diagOf(a)))) {
        converged = true;
        break;
      }
    }
  }
  const atBound = u.map((v, j) => v <= lo(j) || v >= hi(j));
  return {
    outcome: "solved",
    method: "levenberg-marquardt",
    params: u,
    residuals: r,
    sumSquares: ssr,
    iterations: iter,
    ...runEnd(
      converged,
      iter,
      maxIter,
      `the solver stalled after ${iter} iterations: its damping overflowed with no step that lowers the sum of squares`,
    ),
    standardErrors: standardErrors(jac, ssr, atBound),
    atBound,
  };
}

/** sqrt(diag(s²·(JᵀJ)⁻¹)) over the parameters off their bounds; s² = Σr²/(m − n_free). */
function standardErrors(jac: readonly number[][], ssr: number, atBound: readonly boolean[]): (number | undefined)[] {
  const idx = atBound.flatMap((b, j) => (b ? [] : [j]));
  const dof = jac.length - idx.length;
  const none = atBound.map(() => undefined);
  if (dof <= 0 || idx.length === 0) return none;
  const jtj = idx.map((j) => idx.map((k) => jac.reduce((s, row) => s + (row[j] ?? 0) * (row[k] ?? 0), 0)));
  const inv = invertMatrix(jtj);
  if (inv === undefined) return none;
  const s2 = ssr / dof;
  const out: (number | undefined)[] = [...none];
  idx.forEach((j, k) => {
    const v = s2 * (inv[k]?.[k] ?? Number.NaN);
    out[j] = Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : undefined;
  });
  return out;
}
