/**
 * How well a fitted model reproduces the points it came from, in the curve's own unit: the RMS
 * of the residuals (model − point), and the worst point, judged by its residual as a share of the
 * point's value (the gates are stated as shares: 2 % of Vf, 5 % of Rds(on), 5 % of Zth).
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
}

export function fitQuality(
  modelled: readonly number[],
  measured: readonly number[],
  boundFraction: number,
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
  };
}

export const withinBound = (q: FitQuality): boolean => q.worstFraction <= q.boundFraction;

/** The sentence a result's `assumptions` carries for a fit: what was fitted and how well. */
export function describeFit(what: string, q: FitQuality, unit: string, points: number): string {
  const pct = (f: number) => `${(100 * f).toPrecision(3)} %`;
  return (
    `${what}: least-squares fit to ${points} points, RMS residual ${q.rms.toPrecision(3)} ${unit}, worst ${q.worst.toPrecision(3)} ${unit} ` +
    `(${pct(q.worstFraction)}) at point ${q.worstIndex}` +
    (withinBound(q)
      ? ` (bound ${pct(q.boundFraction)})`
      : `, beyond the ${pct(q.boundFraction)} bound: accepted by the caller (acceptFit)`)
  );
}

/** Why a fit beyond its bound is refused: the point, its residual and the bound. */
export function beyondBoundReason(q: FitQuality, unit: string, describePoint: (i: number) => string): string {
  return (
    `the fit misses point ${q.worstIndex} (${describePoint(q.worstIndex)}) by ${q.worst.toPrecision(3)} ${unit} ` +
    `(${(100 * q.worstFraction).toPrecision(3)} %), beyond the ${(100 * q.boundFraction).toPrecision(3)} % bound; ` +
    "check the points, or set acceptFit: true to use the fit as it is"
  );
}
