import { cToK } from "../physics/constants.js";
import { bracketedRoot } from "./root-find.js";

/** The loss at a junction temperature, or a failure the caller records (e.g. the circuit collapsed). */
export type LossAt<F> = (
  tK: number,
) => { readonly ok: true; readonly lossW: number } | { readonly ok: false; readonly failure: F };

export type FixedPointResult<F> =
  /** loopGain: Rth·dP/dTj at the root, absent when the caller did not ask for it (probeGain false). */
  | {
      readonly kind: "root";
      readonly tjK: number;
      readonly lossW: number;
      readonly loopGain?: number;
      readonly evaluations: number;
    }
  | {
      readonly kind: "runaway";
      readonly searchedToK: number;
      readonly lossAtEndW: number;
      readonly loopGainAtEnd: number;
    }
  | { readonly kind: "failed"; readonly failure: F; readonly atK: number };

/** Width of the bracket at which the root is taken, K. */
const ROOT_TOL_K = 1e-9;
/**
 * Secant correction below which the root is taken, K: far below ROOT_TOL_K, so a search that stops
 * on it is as accurate as one that closes the bracket (the secant converges superlinearly, so
 * the tighter test costs at most one more circuit solve).
 */
const STEP_TOL_K = 1e-12;

/**
 * The lowest solution of Tj = Ta + Rth·P(Tj) (the stable operating point where Rth·dP/dTj < 1).
 * h(T) = Ta + Rth·P(T) − T is ≥ 0 at T = Ta; the search takes fixed-point and secant steps upward
 * until h changes sign and then closes the bracket by regula falsi (Illinois). If h stays
 * positive up to ceilingC the loss rises faster than the thermal path sheds it: runaway.
 * With probeGain (the default) the root also carries Rth·dP/dTj, by a forward difference over
 * 0.01 K (one more evaluation of the loss).
 */
export function thermalFixedPoint<F>(
  ambientC: number,
  rthKPerW: number,
  ceilingC: number,
  lossAt: LossAt<F>,
  probeGain = true,
): FixedPointResult<F> {
  const taK = cToK(ambientC);
  const ceilingK = Math.max(cToK(ceilingC), taK);
  const state: { failure?: { failure: F; atK: number } } = {};
  let evaluations = 0;
  // The root finder's last evaluation is usually the root itself: remember it.
  let lastK = Number.NaN;
  let lastLossW = Number.NaN;
  const loss = (tK: number): number => {
    if (tK === lastK) return lastLossW;
    evaluations += 1;
    const r = lossAt(tK);
    if (!r.ok) {
      state.failure ??= { failure: r.failure, atK: tK };
      return Number.NaN;
    }
    lastK = tK;
    lastLossW = r.lossW;
    return r.lossW;
  };
  const failed = (): FixedPointResult<F> | undefined =>
    state.failure === undefined
      ? undefined
      : { kind: "failed", failure: state.failure.failure, atK: state.failure.atK };
  const h = (tK: number): number => taK + rthKPerW * loss(tK) - tK;
  // Rth·dP/dT by a forward difference over 0.01 K from the root (one extra circuit solve).
  const gain = (tK: number, atRootW: number): number => {
    const d = 0.01;
    const b = loss(tK + d);
    return Number.isFinite(b) && Number.isFinite(atRootW) ? (rthKPerW * (b - atRootW)) / d : 0;
  };
  const done = (tjK: number): FixedPointResult<F> => {
    const lossW = loss(tjK);
    {
      const f = failed();
      if (f) return f;
    }
    // The gain probe is one more circuit solve: only when the caller reports the gain.
    if (!probeGain) return { kind: "root", tjK, lossW, evaluations };
    return { kind: "root", tjK, lossW, loopGain: gain(tjK, lossW), evaluations };
  };

  let t = taK;
  let ht = h(t);
  {
    const f = failed();
    if (f) return f;
  }
  if (ht <= 0 || rthKPerW === 0) return done(t);
  for (let step = 0; step < 200; step += 1) {
    let next = Math.min(t + ht, ceilingK);
    let hn = h(next);
    {
      const f = failed();
      if (f) return f;
    }
    if (hn > 0) {
      // Secant steps through the last two points while both lie below the root (h > 0) on a
      // falling h; converged from below when the correction left is under the tolerance.
      let slope = (hn - ht) / (next - t);
      for (let k = 0; k < 100 && hn > 0 && slope < 0; k += 1) {
        const secant = Math.min(next - hn / slope, ceilingK);
        if (!(secant > next)) break;
        t = next;
        ht = hn;
        next = secant;
        hn = h(next);
        {
          const f = failed();
          if (f) return f;
        }
        slope = (hn - ht) / (next - t);
        if (hn > 0 && slope < 0 && hn / -slope < STEP_TOL_K) return done(next);
      }
    }
    if (hn <= 0) {
      const root = bracketedRoot(h, t, next, ht, hn, ROOT_TOL_K, 200, STEP_TOL_K).x;
      {
        const f = failed();
        if (f) return f;
      }
      return done(root);
    }
    if (next >= ceilingK) break;
    t = next;
    ht = hn;
  }
  const lossAtEndW = loss(ceilingK);
  {
    const f = failed();
    if (f) return f;
  }
  return { kind: "runaway", searchedToK: ceilingK, lossAtEndW, loopGainAtEnd: gain(ceilingK, lossAtEndW) };
}
