/**
 * One piece of the series R-L-C loop's closed form (rlc-series.ts gives the derivation): x' = A·x +
 * b with an optional exponential forcing, exact in time. A loop whose input is held at the start
 * (RlcLoop.hold) is two such pieces, the second in Linear2.next; the functions here read only the
 * first, and rlc-series.ts's stateAt, rateAt, stateIntegral, extremaTimes and firstCrossing follow
 * the pieces in turn, the state carried across the boundary.
 */
export interface Linear2 {
  readonly a11: number;
  readonly a12: number;
  readonly a21: number;
  readonly a22: number;
  readonly b1: number;
  readonly b2: number;
  /** An exponential forcing (e1·e^(μt), 0) on the current equation; absent: none. */
  readonly forcing?: { readonly e1: number; readonly mu: number };
  /**
   * A held start (RlcLoop.hold): from atS on the loop is `system`, its own time from 0 at atS and
   * its state continuing from this one's at atS. Read through rlc-series.ts, which follows it.
   */
  readonly next?: { readonly atS: number; readonly system: Linear2 };
}
export type Vec2 = readonly [number, number];

/** The first piece alone (its `next` dropped). */
export function firstPiece(s: Linear2): Linear2 {
  if (s.next === undefined) return s;
  const { next: _later, ...first } = s;
  return first;
}

/** A − μI (the forcing dropped). */
export function shifted(s: Linear2, mu: number): Linear2 {
  return { a11: s.a11 - mu, a12: s.a12, a21: s.a21, a22: s.a22 - mu, b1: s.b1, b2: s.b2 };
}

/** The forcing's particular amplitude xe = (μI − A)⁻¹·e, and μ ([0, 0] and 0 without forcing). */
export function forcedPart(s: Linear2): { xe: Vec2; mu: number } {
  if (s.forcing === undefined) return { xe: [0, 0], mu: 0 };
  const { e1, mu } = s.forcing;
  const r = inverseApply(shifted(s, mu), [e1, 0]);
  return { xe: [-r[0], -r[1]], mu };
}

export function det2(s: Linear2): number {
  return s.a11 * s.a22 - s.a12 * s.a21;
}

/** e^(m·t)·c(t) and e^(m·t)·s(t), overflow-free in every regime. */
export function dampedPair(s: Linear2, t: number): { ec: number; es: number } {
  const m = (s.a11 + s.a22) / 2;
  const q = m * m - det2(s);
  const scale = Math.max(m * m, Math.abs(det2(s)), 1e-300);
  const e = Math.exp(m * t);
  if (Math.abs(q) <= 1e-12 * scale) {
    return { ec: e, es: e * t };
  }
  if (q < 0) {
    const w = Math.sqrt(-q);
    const wt = w * t;
    return { ec: e * Math.cos(wt), es: wt < 1e-6 ? e * t * (1 - (wt * wt) / 6) : (e * Math.sin(wt)) / w };
  }
  const b = Math.sqrt(q);
  const bt = b * t;
  if (bt < 1e-4) return { ec: e * (1 + (bt * bt) / 2), es: e * t * (1 + (bt * bt) / 6) };
  // m ± β; the root nearer zero through the product of the eigenvalues, without cancellation.
  const fast = m - b;
  const slow = m < 0 ? det2(s) / fast : m + b;
  const eSlow = Math.exp(slow * t);
  const eFast = Math.exp(fast * t);
  return { ec: (eSlow + eFast) / 2, es: (eSlow - eFast) / (2 * b) };
}

/** e^(At)·v. */
export function expApply(s: Linear2, t: number, v: Vec2): Vec2 {
  const m = (s.a11 + s.a22) / 2;
  const { ec, es } = dampedPair(s, t);
  return [ec * v[0] + es * ((s.a11 - m) * v[0] + s.a12 * v[1]), ec * v[1] + es * (s.a21 * v[0] + (s.a22 - m) * v[1])];
}

/** A⁻¹·v; the caller guarantees det(A) ≠ 0. */
export function inverseApply(s: Linear2, v: Vec2): Vec2 {
  const d = det2(s);
  return [(s.a22 * v[0] - s.a12 * v[1]) / d, (-s.a21 * v[0] + s.a11 * v[1]) / d];
}

export function particular(s: Linear2): Vec2 {
  const p = inverseApply(s, [s.b1, s.b2]);
  return [-p[0], -p[1]];
}

/** Exact state x(t). */
export function pieceState(s: Linear2, x0: Vec2, t: number): Vec2 {
  return pieceStateFrom(s, x0)(t);
}

/** pieceState as a function of t, its parts that do not depend on t computed once (rlc-series.ts stateFrom). */
export function pieceStateFrom(s: Linear2, x0: Vec2): (t: number) => Vec2 {
  const xp = particular(s);
  const { xe, mu } = forcedPart(s);
  const y0: Vec2 = [x0[0] - xp[0] - xe[0], x0[1] - xp[1] - xe[1]];
  return (t) => {
    const f = Math.exp(mu * t);
    const y = expApply(s, t, y0);
    return [xp[0] + xe[0] * f + y[0], xp[1] + xe[1] * f + y[1]];
  };
}

/** The natural part's rate v = A·(x0 − xp − xe) = A·x0 + b + e − μ·xe: x'(t) = e^(At)·v + μ·xe·e^(μt). */
function naturalRate(s: Linear2, x0: Vec2): Vec2 {
  const { xe, mu } = forcedPart(s);
  const e1 = s.forcing?.e1 ?? 0;
  return [s.a11 * x0[0] + s.a12 * x0[1] + s.b1 + e1 - mu * xe[0], s.a21 * x0[0] + s.a22 * x0[1] + s.b2 - mu * xe[1]];
}

/** Exact derivative x'(t) = e^(At)·v + μ·xe·e^(μt) (without forcing: e^(At)·(A·x0 + b)). */
export function pieceRate(s: Linear2, x0: Vec2, t: number): Vec2 {
  const { xe, mu } = forcedPart(s);
  const f = mu * Math.exp(mu * t);
  const y = expApply(s, t, naturalRate(s, x0));
  return [y[0] + xe[0] * f, y[1] + xe[1] * f];
}

/** Exact ∫₀ᵗ x dt = xp·t + xe·(e^(μt) − 1)/μ + A⁻¹·(e^(At) − I)·(x0 − xp − xe). */
export function pieceIntegral(s: Linear2, x0: Vec2, t: number): Vec2 {
  const xp = particular(s);
  const { xe, mu } = forcedPart(s);
  const g = mu === 0 ? 0 : Math.expm1(mu * t) / mu;
  const y0: Vec2 = [x0[0] - xp[0] - xe[0], x0[1] - xp[1] - xe[1]];
  const y = expApply(s, t, y0);
  const r = inverseApply(s, [y[0] - y0[0], y[1] - y0[1]]);
  return [xp[0] * t + xe[0] * g + r[0], xp[1] * t + xe[1] * g + r[1]];
}

/**
 * Times in (0, tMax] where w·x'(t) = 0, i.e. the extrema of the output w·x, ascending, at most
 * maxCount. Without forcing w·x'(t) = w·e^(At)·x'(0) (zerosOf). With it, w·x'(t) =
 * w·e^(At)·v + κ·e^(μt) = e^(μt)·h(t), h(t) = w·e^((A−μI)t)·v + κ, κ = μ·w·xe. h's own extrema
 * are the zeros of h'(t) = e^(−μt)·w·e^(At)·(A−μI)·v, closed form (zerosOf), so h — and with it
 * w·x', of the same sign — is monotone between them and each such segment holds at most one zero,
 * closed by bisection on w·x' itself (no e^(−μt) to overflow for a fast decay).
 */
export function pieceExtrema(s: Linear2, x0: Vec2, w: Vec2, tMax: number, maxCount: number): number[] {
  if (s.forcing === undefined) return zerosOf(s, pieceRate(s, x0, 0), w, tMax, maxCount);
  const { mu } = forcedPart(s);
  const sh = shifted(s, mu);
  const v = naturalRate(s, x0);
  const f = (t: number): number => {
    const r = pieceRate(s, x0, t);
    return w[0] * r[0] + w[1] * r[1];
  };
  const sv: Vec2 = [sh.a11 * v[0] + sh.a12 * v[1], sh.a21 * v[0] + sh.a22 * v[1]];
  const out: number[] = [];
  let a = 0;
  let fa = f(0);
  for (const b of [...zerosOf(s, sv, w, tMax, 4000), tMax]) {
    const fb = f(b);
    if (fa * fb < 0 && b > a) out.push(bisect(f, a, b, fa));
    else if (fb === 0 && b < tMax) out.push(b);
    if (out.length >= maxCount) break;
    a = b;
    fa = fb;
  }
  return out;
}

export function bisect(f: (t: number) => number, a: number, b: number, fa: number): number {
  let lo = a;
  let hi = b;
  let flo = fa;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * Math.max(hi, 1e-300); i += 1) {
    const mid = 0.5 * (lo + hi);
    const fm = f(mid);
    if (fm === 0) return mid;
    if (fm * flo < 0) hi = mid;
    else {
      lo = mid;
      flo = fm;
    }
  }
  return 0.5 * (lo + hi);
}

/**
 * Times in (0, tMax] where w·e^(At)·r0 = 0, ascending, at most maxCount. It is e^(mt)·(d·c(t) +
 * g·s(t)) with d = w·r0, g = w·(A − mI)·r0: zeros at (kπ − ψ)/ω, ψ = atan2(d, g/ω) when
 * under-damped; at most one, atanh(β·τ)/β with τ = −d/g, otherwise.
 */
function zerosOf(s: Linear2, r0: Vec2, w: Vec2, tMax: number, maxCount: number): number[] {
  const m = (s.a11 + s.a22) / 2;
  const q = m * m - det2(s);
  const d = w[0] * r0[0] + w[1] * r0[1];
  const g = w[0] * ((s.a11 - m) * r0[0] + s.a12 * r0[1]) + w[1] * (s.a21 * r0[0] + (s.a22 - m) * r0[1]);
  const scale = Math.max(m * m, Math.abs(det2(s)), 1e-300);
  const out: number[] = [];
  if (q < -1e-12 * scale) {
    const om = Math.sqrt(-q);
    const psi = Math.atan2(d, g / om);
    for (let k = psi > 0 ? 1 : 0; out.length < maxCount; k += 1) {
      const t = (k * Math.PI - psi) / om;
      if (t > tMax) break;
      if (t > 0) out.push(t);
    }
    return out;
  }
  if (g === 0) return out;
  const tau = -d / g;
  if (!(tau > 0)) return out;
  const beta = Math.sqrt(Math.max(q, 0));
  const x = beta * tau;
  if (x >= 1) return out;
  const t = x < 1e-6 ? tau * (1 + (x * x) / 3) : Math.atanh(x) / beta;
  if (t <= tMax) out.push(t);
  return out;
}

/**
 * First time in [0, tMax] at which y(t) = w·x(t) reaches `level`, or undefined. Between
 * consecutive extrema y is monotone, so each segment holds at most one crossing, which is then
 * closed by bisection to 1e-15 of the segment (the closed form is cheap).
 */
export function pieceCrossing(s: Linear2, x0: Vec2, w: Vec2, level: number, tMax: number): number | undefined {
  const y = (t: number): number => {
    const x = pieceState(s, x0, t);
    return w[0] * x[0] + w[1] * x[1] - level;
  };
  const y0 = y(0);
  if (y0 === 0) return 0;
  const ends = [...pieceExtrema(s, x0, w, tMax, 4000), tMax];
  let a = 0;
  let fa = y0;
  for (const b of ends) {
    const fb = y(b);
    if (fb === 0) return b;
    if (fa * fb < 0) return bisect(y, a, b, fa);
    a = b;
    fa = fb;
  }
  return undefined;
}

/** The slowest decay rate of the loop's natural response, 1/s (> 0 when it decays). */
export function slowestDecayPerS(s: Linear2): number {
  const m = (s.a11 + s.a22) / 2;
  const q = m * m - det2(s);
  if (q <= 0) return -m;
  const b = Math.sqrt(q);
  return m < 0 ? -det2(s) / (m - b) : -(m + b);
}
