/**
 * Root of f on [lo, hi] with f(lo) and f(hi) of opposite sign, by Newton steps kept inside a
 * shrinking bracket (a step that would leave the bracket is replaced by bisection): quadratic
 * near the root, never worse than bisection (Press et al., Numerical Recipes, "rtsafe").
 * fdf returns [f(x), f'(x)]; x0 is a warm start, used when it lies inside the bracket.
 */
export function safeNewton(
  fdf: (x: number) => readonly [number, number],
  lo: number,
  hi: number,
  flo: number,
  x0: number,
  tolX: number,
  maxIter = 100,
): number {
  const rising = flo < 0;
  let x = x0 > lo && x0 < hi ? x0 : 0.5 * (lo + hi);
  for (let k = 0; k < maxIter; k += 1) {
    const [f, df] = fdf(x);
    if (f === 0) return x;
    if (f < 0 === rising) lo = x;
    else hi = x;
    let next = df !== 0 ? x - f / df : Number.NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= tolX || hi - lo <= tolX) return next;
    x = next;
  }
  return x;
}
