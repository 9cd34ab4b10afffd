import { iterationCapReason } from "./least-squares.js";

/**
 * How well a fitted model reproduces the points it came from, in the curve's own unit: the RMS
 * of the residuals (model − point), and the worst point, judged by its residual as a share of the
 * point's value (the gates are stated as shares: 2 % of Vf, 5 % of Rds(on), 5 % of Zth); and
 * whether the solver converged or stopped before (at its iteration cap, or stalled: least-squares.ts), its parameters
 * then being wherever the last step left them.
 */
export interface FitQuality {
  /** Root mean square of model − point, in the curve's unit. */
  readonly rms: number;
  /** Index of the worst point (largest |model − point| / |point|), in the caller's order. */
  readonly worstIndex: number;
  /** model − point at the worst point, in the curve's unit. */
  readonly worst: number;
  /** |worst| / |point value| at the worst point. */
  readonly worstFraction: number;
  /** The stated bound on worstFraction. */
  readonly boundFraction: number;
  /** False when the solver stopped before its convergence test passed (its iteration cap, a stall). */
  readonly converged: boolean;
  /** Iterations the solver took. */
  readonly iterations: number;
  /** Why the solver stopped before converging (absent when converged). */
  readonly stopReason?: string;
}

/** What the solver says of its own run (least-squares.ts's `converged`, `iterations` and `stopReason`). */
export interface SolverRun {
  readonly converged: boolean;
  readonly iterations: number;
  readonly stopReason?: string | undefined;
}

export function fitQuality(
  modelled: readonly number[],
  measured: readonly number[],
  boundFraction: number,
  run: SolverRun,
): FitQuality {
  let ss = 0;
  let worstIndex = 0;
  let worstFraction = -1;
  measured.forEach((y, i) => {
    const d = (modelled[i] ?? 0) - y;
    ss += d * d;
    const f = Math.abs(d) / Math.max(Math.abs(y), Number.MIN_VALUE);
    if (f > worstFraction) {
      worstFraction = f;
      worstIndex = i;
    }
  });
  const worst = (modelled[worstIndex] ?? 0) - (measured[worstIndex] ?? 0);
  return {
    rms: Math.sqrt(ss / Math.max(measured.length, 1)),
    worstIndex,
    worst,
    worstFraction: Math.max(worstFraction, 0),
    boundFraction,
    converged: run.converged,
    iterations: run.iterations,
    ...(run.converged ? {} : { stopReason: run.stopReason ?? iterationCapReason(run.iterations) }),
  };
}

export const withinBound = (q: FitQuality): boolean => q.worstFraction <= q.boundFraction;

/** A fit the gate passes without the caller's acceptance: converged, and its worst residual within the bound. */
export const fitPasses = (q: FitQuality): boolean => q.converged && withinBound(q);

const CAPPED = (q: FitQuality) => q.stopReason ?? iterationCapReason(q.iterations);

/** The sentence a result's `assumptions` carries for a fit: what was fitted and how well. */
export function describeFit(what: string, q: FitQuality, unit: string, points: number): string {
  const pct = (f: number) => `${(100 * f).toPrecision(3)} %`;
  return (
    `${what}: least-squares fit to ${points} points, RMS residual ${q.rms.toPrecision(3)} ${unit}, worst ${q.worst.toPrecision(3)} ${unit} ` +
    `(${pct(q.worstFraction)}) at point ${q.worstIndex}` +
    (withinBound(q) ? ` (bound ${pct(q.boundFraction)})` : `, beyond the ${pct(q.boundFraction)} bound`) +
    (q.converged ? "" : `; ${CAPPED(q)}`) +
    (fitPasses(q) ? "" : ": accepted by the caller (acceptFit)")
  );
}

/**
 * Why a fit the gate does not pass is refused: the point, its residual and the bound; or, within
 * the bound, that the solver stopped before converging (the parameters are not a converged minimum).
 */
export function beyondBoundReason(q: FitQuality, unit: string, describePoint: (i: number) => string): string {
  if (withinBound(q))
    return (
      `${CAPPED(q)}, so its parameters are not a converged least-squares solution ` +
      `(worst residual ${q.worst.toPrecision(3)} ${unit} at point ${q.worstIndex}); ` +
      "check the points (fewer stages or parameters may converge), or set acceptFit: true to use the fit as it is"
    );
  return (
    `the fit misses point ${q.worstIndex} (${describePoint(q.worstIndex)}) by ${q.worst.toPrecision(3)} ${unit} ` +
    `(${(100 * q.worstFraction).toPrecision(3)} %), beyond the ${(100 * q.boundFraction).toPrecision(3)} % bound` +
    (q.converged ? "; " : ` (and ${CAPPED(q)}); `) +
    "check the points, or set acceptFit: true to use the fit as it is"
  );
}
