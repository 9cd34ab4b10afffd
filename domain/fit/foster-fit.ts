import { type FosterTerm, zthKPerW } from "../physics/foster.js";
import { type CurveFit, firstFall, refuse } from "./curve-fit.js";
import { type FitQuality, fitPasses, fitQuality, type SolverRun } from "./fit-quality.js";
import { leastSquares } from "./least-squares.js";

export interface ZthPoint {
  readonly timeS: number;
  readonly zthKPerW: number;
}

/** The bound on a Zth fit's worst residual: 5 % of Zth (issue 23's gate). */
export const ZTH_FIT_BOUND = 0.05;
export const MAX_FOSTER_STAGES = 5;

export interface FosterFitOptions {
  /** Number of stages, 1..5; absent: the fewest whose fit converges within the 5 % bound (else the best of 1..5). */
  readonly stages?: number;
  /** The steady value ΣR must equal, K/W (the datasheet's Rth); absent: ΣR is fitted freely. */
  readonly steadyKPerW?: number;
}

export type FosterFit = CurveFit<{ readonly terms: readonly FosterTerm[]; readonly steadyKPerW: number }>;

const LN_TAU = [Math.log(1e-9), Math.log(1e6)] as const;

/**
 * Fit a Foster network Zth(t) = Σ Ri·(1 − e^(−t/τi)) (foster.ts, JESD51-14 practice) to the points
 * of a single-pulse transient thermal impedance curve, by least squares on the relative residual
 * (Zmodel − Z)/Z, so that the short-time points, decades below the steady value, weigh as much as
 * the long. With a steady value S the terms are Ri = S·e^(ai)/Σe^(aj) (a1 = 0): positive, and ΣR
 * equals S exactly. τi in 1 ns..10⁶ s. Several deterministic starts (the τi spread evenly in log
 * time over the points' span, and that span widened and narrowed threefold); the best is kept.
 * Refused: a Zth that falls with time (by more than the bound), or (with S) a point above S by more than the bound — no
 * Foster network follows either — with the offending points; fewer points than parameters.
 */
export function fitFoster(points: readonly ZthPoint[], opts: FosterFitOptions = {}): FosterFit {
  const ts = points.map((p) => p.timeS);
  const zs = points.map((p) => p.zthKPerW);
  const fall = firstFall(ts, zs, ZTH_FIT_BOUND);
  if (fall !== undefined)
    return refuse(
      `Zth falls by more than 5 % with time between points ${fall[0]} and ${fall[1]}: no Foster network follows that (each term rises with time)`,
      fall,
    );
  const s = opts.steadyKPerW;
  if (s !== undefined) {
    const over = zs.findIndex((z) => z > s * (1 + ZTH_FIT_BOUND));
    if (over >= 0)
      return refuse(
        `point ${over} (Zth ${zs[over]} K/W) is above the steady value ${s} K/W: ΣR of a Foster network bounds Zth`,
        [over],
      );
  }
  const paramsFor = (k: number) => (s === undefined ? 2 * k : 2 * k - 1);
  const most = Math.min(MAX_FOSTER_STAGES, Math.floor((points.length + (s === undefined ? 0 : 1)) / 2));
  if (opts.stages !== undefined && paramsFor(opts.stages) > points.length) {
    return refuse(
      `${opts.stages} stages have ${paramsFor(opts.stages)} parameters: give at least as many points (${points.length} given)`,
    );
  }
  if (most < 1) return refuse("a Foster fit needs at least two points (one with the steady value)");
  const candidates = opts.stages === undefined ? Array.from({ length: most }, (_, i) => i + 1) : [opts.stages];
  let best: Extract<FosterFit, { ok: true }> | undefined;
  for (const k of candidates) {
    const fit = fitStages(points, k, s);
    if (fit === undefined) continue;
    if (best === undefined || fit.quality.worstFraction < best.quality.worstFraction) best = fit;
    if (opts.stages === undefined && fitPasses(fit.quality)) return fit;
  }
  return best ?? refuse("the Foster fit did not reach a finite solution");
}

function fitStages(
  points: readonly ZthPoint[],
  k: number,
  steady: number | undefined,
): Extract<FosterFit, { ok: true }> | undefined {
  const tMin = Math.min(...points.map((p) => p.timeS));
  const tMax = Math.max(...points.map((p) => p.timeS));
  const zMax = Math.max(...points.map((p) => p.zthKPerW));
  const terms = (u: readonly number[]): FosterTerm[] => {
    const taus = u.slice(0, k).map(Math.exp);
    if (steady === undefined) return taus.map((tauS, i) => ({ tauS, rKPerW: Math.exp(u[k + i] ?? 0) }));
    const w = [0, ...u.slice(k)].map(Math.exp);
    const sum = w.reduce((a, b) => a + b, 0);
    return taus.map((tauS, i) => ({ tauS, rKPerW: (steady * (w[i] ?? 0)) / sum }));
  };
  const residuals = (u: readonly number[]) => {
    const net = terms(u);
    return points.map((p) => (zthKPerW(net, p.timeS) - p.zthKPerW) / p.zthKPerW);
  };
  const lower = [
    ...new Array<number>(k).fill(LN_TAU[0]),
    ...new Array<number>(steady === undefined ? k : k - 1).fill(steady === undefined ? Math.log(1e-9) : -40),
  ];
  const upper = [
    ...new Array<number>(k).fill(LN_TAU[1]),
    ...new Array<number>(steady === undefined ? k : k - 1).fill(steady === undefined ? Math.log(1e4) : 40),
  ];
  let best: { u: readonly number[]; ssr: number; run: SolverRun } | undefined;
  for (const widen of [1, 3, 1 / 3]) {
    const lo = Math.log(tMin / widen);
    const hi = Math.log(tMax * widen);
    const lnTaus = Array.from({ length: k }, (_, i) => (k === 1 ? (lo + hi) / 2 : lo + ((hi - lo) * i) / (k - 1)));
    const start =
      steady === undefined
        ? [...lnTaus, ...new Array<number>(k).fill(Math.log(zMax / k))]
        : [...lnTaus, ...new Array<number>(k - 1).fill(0)];
    const sol = leastSquares({ residuals, start, lower, upper, maxIterations: 150 });
    if (sol.outcome !== "solved" || !Number.isFinite(sol.sumSquares)) continue;
    if (best === undefined || sol.sumSquares < best.ssr) best = { u: sol.params, ssr: sol.sumSquares, run: sol };
  }
  if (best === undefined) return undefined;
  const net = terms(best.u).sort((a, b) => a.tauS - b.tauS);
  const modelled = points.map((p) => zthKPerW(net, p.timeS));
  const quality: FitQuality = fitQuality(
    modelled,
    points.map((p) => p.zthKPerW),
    ZTH_FIT_BOUND,
    best.run,
  );
  // Standard errors of single terms of a sum of exponentials are not meaningful (the terms trade
  // off against each other); the fit states its residuals instead.
  return {
    ok: true,
    params: { terms: net, steadyKPerW: net.reduce((a, t) => a + t.rKPerW, 0) },
    standardErrors: {},
    quality,
    modelled,
  };
}
