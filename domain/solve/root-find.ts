/**
 * Bracketed root of a continuous f on [a, b] with f(a)·f(b) ≤ 0, by the Illinois variant of
 * regula falsi (Dowell & Jarratt, BIT 11, 1971): superlinear, and never leaves the bracket.
 * Stops when the bracket is narrower than tolX, or (with stepTolX) when the secant correction
 * |f(x)/f'(x)| estimated from the last two iterates (their true values, not Illinois' halved
 * ones) is below stepTolX: the usual stopping test of the secant method, which saves the last
 * iterations a one-sided regula falsi spends closing the far end of the bracket.
 */
export function bracketedRoot(
  f: (x: number) => number,
  a: number,
  b: number,
  fa: number,
  fb: number,
  tolX: number,
  maxIter = 200,
  stepTolX?: number,
): { x: number; fx: number; iterations: number } {
  if (fa === 0) return { x: a, fx: 0, iterations: 0 };
  if (fb === 0) return { x: b, fx: 0, iterations: 0 };
  let side = 0;
  let x = a;
  let fx = fa;
  // The previous iterate, for the secant estimate of the correction: first the nearer end.
  let px = Math.abs(fa) < Math.abs(fb) ? a : b;
  let pf = px === a ? fa : fb;
  for (let i = 1; i <= maxIter; i += 1) {
    x = (a * fb - b * fa) / (fb - fa);
    if (!(x > Math.min(a, b) && x < Math.max(a, b))) x = 0.5 * (a + b);
    fx = f(x);
    if (fx === 0 || Math.abs(b - a) < tolX) return { x, fx, iterations: i };
    if (stepTolX !== undefined) {
      const slope = (fx - pf) / (x - px);
      if (slope !== 0 && Math.abs(fx / slope) < stepTolX) return { x, fx, iterations: i };
      px = x;
      pf = fx;
    }
    if (fx * fb > 0) {
      b = x;
      fb = fx;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = x;
      fa = fx;
      if (side === 1) fb /= 2;
      side = 1;
    }
    if (Math.abs(b - a) < tolX) return { x, fx, iterations: i };
  }
  return { x, fx, iterations: maxIter };
}

/** Maximum of a unimodal f on [a, b] by golden-section search. */
export function goldenMax(f: (x: number) => number, a: number, b: number, tolX: number): { x: number; fx: number } {
  const r = (Math.sqrt(5) - 1) / 2;
  let c = b - r * (b - a);
  let d = a + r * (b - a);
  let fc = f(c);
  let fd = f(d);
  while (Math.abs(b - a) > tolX) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - r * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + r * (b - a);
      fd = f(d);
    }
  }
  return fc > fd ? { x: c, fx: fc } : { x: d, fx: fd };
}
