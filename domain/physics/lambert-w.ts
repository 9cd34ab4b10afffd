/**
 * Principal branch of the Lambert W function and the Wright omega function.
 *
 * W0(x) solves w·e^w = x for x ≥ -1/e, w ≥ -1. ω(x) = W0(e^x) solves ω + ln ω = x and is the
 * form to use when the argument of W is an exponential that would overflow (Corless et al.,
 * "On the Lambert W function", Adv. Comput. Math. 5, 1996; Wright omega: Corless & Jeffrey 2002).
 * Both use Halley's iteration, which converges cubically from the starting guesses below.
 */

/** W0(x) for x ≥ -1/e. Returns NaN only for x < -1/e (a caller bug, never user data). */
export function lambertW0(x: number): number {
  if (x < -1 / Math.E) return Number.NaN;
  if (x === 0) return 0;
  if (x > 1e300) return wrightOmega(Math.log(x));
  // Starting guess: branch-point series near -1/e, log asymptotics for large x, else ln(1+x).
  let w: number;
  if (x < -0.25) {
    const p = Math.sqrt(2 * (Math.E * x + 1));
    w = -1 + p - (p * p) / 3;
  } else if (x < 3) {
    w = Math.log1p(x);
    if (x < 0) w = x * (1 - x);
  } else {
    const l1 = Math.log(x);
    const l2 = Math.log(l1);
    w = l1 - l2 + l2 / l1;
  }
  for (let i = 0; i < 50; i += 1) {
    const ew = Math.exp(w);
    const f = w * ew - x;
    const wp1 = w + 1;
    if (wp1 === 0) break;
    const step = f / (ew * wp1 - ((w + 2) * f) / (2 * wp1));
    w -= step;
    if (Math.abs(step) <= 1e-15 * (1 + Math.abs(w))) break;
  }
  return w;
}

/** Wright omega ω(x) = W0(e^x) for real x, computed without forming e^x. */
export function wrightOmega(x: number): number {
  if (x < -700) return Math.exp(x); // ω ≈ e^x to double precision
  if (x < -10) {
    // Series W(z) = z − z² + 3z³/2 − 8z⁴/3 … with z = e^x < 4.6e-5: the next term is below 1e-17·z.
    const z = Math.exp(x);
    return z * (1 - z * (1 - 1.5 * z));
  }
  if (x < 1) return lambertW0(Math.exp(x));
  // Solve g(w) = w + ln w - x = 0 by Halley: g' = 1 + 1/w, g'' = -1/w².
  let w = x - Math.log(x);
  for (let i = 0; i < 50; i += 1) {
    const g = w + Math.log(w) - x;
    const g1 = 1 + 1 / w;
    const g2 = -1 / (w * w);
    const step = g / (g1 - (g * g2) / (2 * g1));
    w -= step;
    if (Math.abs(step) <= 1e-15 * (1 + Math.abs(w))) break;
  }
  return w;
}
