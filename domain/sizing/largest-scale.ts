import { bracketedRoot } from "../solve/root-find.js";

/**
 * The largest scale factor k > 0 at which a margin g(k) is still ≥ 0, for a g that falls as k
 * grows (loss, junction temperature and drop all rise with a part's Rds(on) or forward drop).
 * g(k) undefined means the trial has no value at all (no operating point: runaway, collapse):
 * it fails. From k = 1 the search doubles (or halves) to a bracket, narrows a bracket whose
 * failing end has no value by geometric bisection, then closes it by regula falsi (Illinois,
 * domain/solve/root-find.ts) on the margin itself. Range [kMin, kMax]: outside, "impossible"
 * (fails even at kMin) or "unbounded" (passes even at kMax).
 */
export type ScaleSearch =
  | { readonly kind: "limit"; readonly k: number; readonly evaluations: number; readonly cliff: boolean }
  | { readonly kind: "unbounded"; readonly kMax: number; readonly evaluations: number }
  | { readonly kind: "impossible"; readonly kMin: number; readonly evaluations: number };

export function largestScale(
  g: (k: number) => number | undefined,
  kMin = 1e-4,
  kMax = 1e4,
  relTol = 1e-9,
): ScaleSearch {
  let evaluations = 0;
  const cache = new Map<number, number | undefined>();
  const at = (k: number): number | undefined => {
    if (cache.has(k)) return cache.get(k);
    evaluations += 1;
    const v = g(k);
    const out = v === undefined || !Number.isFinite(v) ? undefined : v;
    cache.set(k, out);
    return out;
  };
  const ok = (k: number) => {
    const v = at(k);
    return v !== undefined && v >= 0;
  };
  let lo: number;
  let hi: number;
  if (ok(1)) {
    lo = 1;
    hi = 2;
    while (ok(hi)) {
      if (hi >= kMax) return { kind: "unbounded", kMax, evaluations };
      lo = hi;
      hi = Math.min(hi * 2, kMax);
    }
  } else {
    hi = 1;
    lo = 0.5;
    while (!ok(lo)) {
      if (lo <= kMin) return { kind: "impossible", kMin, evaluations };
      hi = lo;
      lo = Math.max(lo / 2, kMin);
    }
  }
  while (at(hi) === undefined && hi / lo - 1 > relTol) {
    const mid = Math.sqrt(lo * hi);
    if (ok(mid)) lo = mid;
    else hi = mid;
  }
  const fHi = at(hi);
  const fLo = at(lo);
  if (fHi === undefined || fLo === undefined) return { kind: "limit", k: lo, evaluations, cliff: true };
  const root = bracketedRoot((k) => at(k) ?? -1, lo, hi, fLo, fHi, relTol * lo);
  return { kind: "limit", k: root.x, evaluations, cliff: false };
}
