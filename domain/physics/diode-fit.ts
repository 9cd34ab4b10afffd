import { thermalVoltageV } from "./constants.js";
import { type DiodeParams, diodeVoltageV } from "./diode.js";

/** One datasheet point of the forward characteristic. */
export interface ForwardPoint {
  readonly currentA: number;
  readonly voltageV: number;
  readonly tempK: number;
}

export interface DiodeFitOptions {
  readonly energyGapEv: number;
  readonly saturationTempExponent: number;
  readonly nominalTempK: number;
  /** With two points: the series resistance to hold fixed (default 0). */
  readonly seriesResistanceOhm?: number;
  /** A linear Vf temperature coefficient instead of the Eg/XTI law, V/K. */
  readonly linearTempCoVPerK?: number;
}

export type DiodeFitResult =
  | { readonly ok: true; readonly params: DiodeParams; readonly maxResidualV: number }
  | { readonly ok: false; readonly code: "fit-failed"; readonly message: string };

/**
 * Fit the Shockley parameters to two or three forward points (I, Vf, T).
 * Two points give Is and n (Rs held, default 0); three give Is, n and Rs. Points at other
 * temperatures are carried to the nominal one through the SPICE Is(T) law with the given Eg and
 * XTI. The system is square, so it is solved exactly by a damped Newton iteration on
 * u = (ln Is, n, Rs) with a finite-difference Jacobian; the fit is refused when the points imply
 * a non-physical parameter (negative Rs, n outside 0.5..10).
 */
export function fitDiode(points: readonly ForwardPoint[], opts: DiodeFitOptions): DiodeFitResult {
  if (points.length < 2 || points.length > 3) {
    return { ok: false, code: "fit-failed", message: "a fit needs two or three points" };
  }
  const fitRs = points.length === 3;
  const sorted = [...points].sort((a, b) => a.currentA - b.currentA);
  const p0 = sorted[0];
  const pN = sorted[sorted.length - 1];
  if (p0 === undefined || pN === undefined) throw new Error("unreachable: sorted has ≥ 2 points");

  const build = (u: readonly number[]): DiodeParams => ({
    saturationCurrentA: Math.exp(u[0] ?? 0),
    ideality: u[1] ?? 1,
    seriesResistanceOhm: fitRs ? (u[2] ?? 0) : (opts.seriesResistanceOhm ?? 0),
    energyGapEv: opts.energyGapEv,
    saturationTempExponent: opts.saturationTempExponent,
    nominalTempK: opts.nominalTempK,
    ...(opts.linearTempCoVPerK === undefined ? {} : { linearTempCoVPerK: opts.linearTempCoVPerK }),
  });
  const residuals = (u: readonly number[]): number[] => {
    const p = build(u);
    return sorted.map((pt) => diodeVoltageV(p, pt.currentA, pt.tempK) - pt.voltageV);
  };

  // Starting point: n from the end points (log slope), Is from the lowest point.
  const vt = thermalVoltageV(p0.tempK);
  const lnRatio = Math.log(pN.currentA / p0.currentA);
  let n0 = (pN.voltageV - p0.voltageV) / (vt * lnRatio);
  if (!Number.isFinite(n0) || n0 < 0.6) n0 = 1.2;
  if (n0 > 8) n0 = 8;
  const u: number[] = [Math.log(p0.currentA) - p0.voltageV / (n0 * vt), n0];
  if (fitRs) u.push(0);
  const dim = u.length;

  let r = residuals(u);
  let norm = Math.hypot(...r);
  for (let iter = 0; iter < 200 && norm > 1e-12; iter += 1) {
    const jac: number[][] = r.map(() => new Array<number>(dim).fill(0));
    for (let j = 0; j < dim; j += 1) {
      const h = 1e-7 * Math.max(1, Math.abs(u[j] ?? 0));
      const up = [...u];
      up[j] = (up[j] ?? 0) + h;
      const rp = residuals(up);
      for (let i = 0; i < r.length; i += 1) {
        const row = jac[i];
        if (row) row[j] = ((rp[i] ?? 0) - (r[i] ?? 0)) / h;
      }
    }
    const step = solveLinear(jac, r.map((v) => -v));
    if (step === undefined) {
      return { ok: false, code: "fit-failed", message: "the points are degenerate (singular fit)" };
    }
    let lambda = 1;
    let accepted = false;
    while (lambda > 1e-6) {
      const trial = u.map((v, j) => v + lambda * (step[j] ?? 0));
      if ((trial[1] ?? 0) > 0.05) {
        const rt = residuals(trial);
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
  const params = build(u);
  const maxResidualV = Math.max(...r.map(Math.abs));
  if (!(maxResidualV < 1e-6)) {
    return { ok: false, code: "fit-failed", message: `no diode law passes through the points (residual ${maxResidualV.toExponential(2)} V)` };
  }
  if (params.ideality < 0.5 || params.ideality > 10) {
    return { ok: false, code: "fit-failed", message: `the points imply an ideality factor of ${params.ideality.toFixed(3)}, outside 0.5..10` };
  }
  if (params.seriesResistanceOhm < 0) {
    return { ok: false, code: "fit-failed", message: `the points imply a negative series resistance (${params.seriesResistanceOhm.toExponential(3)} ohm): the curve bends the wrong way` };
  }
  return { ok: true, params, maxResidualV };
}

/** Gaussian elimination with partial pivoting; undefined when singular. */
function solveLinear(a: readonly number[][], b: readonly number[]): number[] | undefined {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i] ?? 0]);
  for (let c = 0; c < n; c += 1) {
    let piv = c;
    for (let r = c + 1; r < n; r += 1) {
      if (Math.abs(m[r]?.[c] ?? 0) > Math.abs(m[piv]?.[c] ?? 0)) piv = r;
    }
    const pr = m[piv];
    const cr = m[c];
    if (pr === undefined || cr === undefined || Math.abs(pr[c] ?? 0) < 1e-300) return undefined;
    m[piv] = cr;
    m[c] = pr;
    for (let r = 0; r < n; r += 1) {
      const row = m[r];
      if (r === c || row === undefined) continue;
      const f = (row[c] ?? 0) / (pr[c] ?? 1);
      for (let k = c; k <= n; k += 1) row[k] = (row[k] ?? 0) - f * (pr[k] ?? 0);
    }
  }
  return m.map((row, i) => (row[n] ?? 0) / (row[i] ?? 1));
}
