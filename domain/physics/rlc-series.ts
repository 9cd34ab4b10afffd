/**
 * Closed-form response of a series R-L-C loop: a source Vs behind a loop resistance R and
 * inductance L feeds an output node held by a capacitor C (with series ESR) and a load whose
 * current is affine in the output voltage, i_load = I + G·v_out (a constant-current load: G = 0;
 * a resistor: I = 0, G = 1/R; a constant-power load linearised at V0: I = 2P/V0, G = −P/V0²).
 *
 * State x = (i, v_C), loop current i positive from source to output, capacitor voltage v_C:
 *   v_out = k·(v_C + ESR·(i − I)),  k = 1/(1 + ESR·G)
 *   L·di/dt  = Vs − R·i − v_out
 *   C·dvC/dt = i − I − G·v_out
 * which is x' = A·x + b with constant A, b. Its exact solution (textbook linear circuit theory)
 * is x(t) = xp + e^(At)·(x0 − xp), xp = −A⁻¹·b, and for a 2×2 matrix (Cayley-Hamilton / Putzer)
 *   e^(At) = e^(m·t)·[c(t)·I + s(t)·(A − m·I)],  m = tr(A)/2,  q = m² − det(A),
 * with c = cos(ωt), s = sin(ωt)/ω, ω = √−q (under-damped); c = cosh(βt), s = sinh(βt)/β, β = √q
 * (over-damped); c = 1, s = t (critically damped). The three regimes are one formula.
 *
 * A source that decays exponentially, Vs(t) = Vs + ΔV·e^(μt) (μ = −1/τ; an input falling from
 * Vs + ΔV at t = 0+ to Vs), adds a forcing e·e^(μt), e = (ΔV/L, 0), to x' = A·x + b. An exponential
 * forcing has an exponential particular solution (method of undetermined coefficients, textbook
 * linear ODEs): xe·e^(μt) with μ·xe = A·xe + e, so xe = (μI − A)⁻¹·e, and the exact solution is
 *   x(t) = xp + xe·e^(μt) + e^(At)·(x0 − xp − xe),
 * the same closed form with one more exponential term (first order, ESR = 0, no L: the textbook
 * RC charged from V∞ + ΔV·e^(−t/τ)). Where μ is within 1e-10 (relative) of a natural mode
 * (det(A − μI) → 0, resonance: the exact answer there has a t·e^(μt) term) μ is moved by 1e-6 of
 * itself, which changes the forcing by less than that and keeps the cancellation's rounding
 * below 1e-9. The forcing lives in the system (Linear2.forcing); a phase that starts at time t0
 * of the event takes the forcing decayed by e^(μ·t0) (shiftLoop). *
 * A held start (RlcLoop.hold: an input clamp holding the input node at its level while the
 * unclamped source is beyond it) is two pieces: from 0 to untilS the hold's source and
 * resistance, then the loop's own, whose decaying part is counted from the event's t = 0. The
 * state (i, v_C) is continuous at the boundary; stateAt, rateAt, stateIntegral, extremaTimes and
 * firstCrossing follow the pieces in turn (the closed form of one piece: rlc-piece.ts).
 */
import {
  det2,
  firstPiece,
  type Linear2,
  pieceCrossing,
  pieceExtrema,
  pieceIntegral,
  pieceRate,
  pieceState,
  pieceStateFrom,
  shifted,
  type Vec2,
} from "./rlc-piece.js";

export {
  dampedPair,
  det2,
  expApply,
  inverseApply,
  type Linear2,
  particular,
  slowestDecayPerS,
  type Vec2,
} from "./rlc-piece.js";

export interface RlcLoop {
  readonly sourceV: number;
  readonly loopResistanceOhm: number;
  readonly inductanceH: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  /** Load current at zero output voltage, A, and its slope dI/dV, S: i_load = I + G·v_out. */
  readonly loadCurrentA: number;
  readonly loadConductanceS: number;
  /** The source's decaying part: Vs(t) = sourceV + extraV·e^(−t/τ) (absent: a constant source). */
  readonly sourceDecay?: {
    readonly extraV: number;
    readonly tauS: number;
  } /** The input held at the start (an input clamp): the loop's first piece, to untilS (absent: none). */;
  readonly hold?: HeldStart;
}

/**
 * The loop while an input clamp holds the input node (from t = 0 to untilS): the unclamped
 * source behind its resistance and the clamp's level behind its dynamic resistance as one
 * Thevenin source, sourceV + extraV·e^(−t/τ) (τ the loop's sourceDecay's), behind
 * loopResistanceOhm (the stage's resistance included, as the loop's own).
 */
export interface HeldStart {
  readonly untilS: number;
  readonly sourceV: number;
  readonly extraV: number;
  readonly loopResistanceOhm: number;
}

/** The loop from time t0 of it on: its source's decaying part decayed by e^(−t0/τ), a hold shortened by t0. */
export function shiftLoop(p: RlcLoop, t0: number): RlcLoop {
  const h = p.hold;
  if (h !== undefined) {
    const { hold: _h, ...later } = p;
    const rest = shiftLoop(later, t0);
    if (t0 >= h.untilS) return rest;
    const tau = p.sourceDecay?.tauS;
    const extraV = tau === undefined ? h.extraV : h.extraV * Math.exp(-t0 / tau);
    return { ...rest, hold: { ...h, untilS: h.untilS - t0, extraV } };
  }
  if (p.sourceDecay === undefined) return p;
  return { ...p, sourceDecay: { ...p.sourceDecay, extraV: p.sourceDecay.extraV * Math.exp(-t0 / p.sourceDecay.tauS) } };
}

/** The loop's first piece as a loop of its own (a held start's hold; the loop itself without one). */
export function holdPiece(p: RlcLoop): RlcLoop {
  const h = p.hold;
  if (h === undefined) return p;
  const { hold: _h, sourceDecay, ...rest } = p;
  return {
    ...rest,
    sourceV: h.sourceV,
    loopResistanceOhm: h.loopResistanceOhm,
    ...(sourceDecay === undefined ? {} : { sourceDecay: { extraV: h.extraV, tauS: sourceDecay.tauS } }),
  };
}

/** The loop after its hold (the loop itself without one), its time from the event's t = 0. */
export function releasedLoop(p: RlcLoop): RlcLoop {
  if (p.hold === undefined) return p;
  const { hold: _h, ...rest } = p;
  return rest;
}

/** The system from time t0 on (its forcing decayed by e^(μ·t0); a held start's pieces followed). */
export function shiftSystem(s: Linear2, t0: number): Linear2 {
  const n = s.next;
  if (n !== undefined) {
    if (t0 >= n.atS) return shiftSystem(n.system, t0 - n.atS);
    return { ...shiftSystem(firstPiece(s), t0), next: { atS: n.atS - t0, system: n.system } };
  }
  if (s.forcing === undefined) return s;
  return { ...s, forcing: { ...s.forcing, e1: s.forcing.e1 * Math.exp(s.forcing.mu * t0) } };
}

/** The source voltage at time t of the loop, V (the hold's while it holds). */
export function sourceAt(p: RlcLoop, t: number): number {
  if (p.hold !== undefined && t < p.hold.untilS) return sourceAt(holdPiece(p), t);
  return p.sourceV + (p.sourceDecay === undefined ? 0 : p.sourceDecay.extraV * Math.exp(-t / p.sourceDecay.tauS));
}

/** The loop as x' = A·x + b (a held start: the hold, then the loop from untilS on in `next`); k = 1/(1 + ESR·G) must be positive (checked by the caller). */
export function loopSystem(p: RlcLoop): Linear2 {
  const h = p.hold;
  if (h !== undefined) {
    const first = pieceSystem(holdPiece(p));
    if (!(h.untilS < Number.POSITIVE_INFINITY)) return first;
    return { ...first, next: { atS: h.untilS, system: shiftSystem(pieceSystem(releasedLoop(p)), h.untilS) } };
  }
  return pieceSystem(p);
}

function pieceSystem(p: RlcLoop): Linear2 {
  const k = 1 / (1 + p.esrOhm * p.loadConductanceS);
  const l = p.inductanceH;
  const c = p.capacitanceF;
  const base = {
    a11: -(p.loopResistanceOhm + k * p.esrOhm) / l,
    a12: -k / l,
    b1: (p.sourceV + k * p.esrOhm * p.loadCurrentA) / l,
    a21: k / c,
    a22: (-p.loadConductanceS * k) / c,
    b2: (-k * p.loadCurrentA) / c,
  };
  const d = p.sourceDecay;
  if (d === undefined || d.extraV === 0 || !(d.tauS > 0)) return base;
  let mu = -1 / d.tauS;
  const scale = Math.max(mu * mu, Math.abs(det2(base)), ((base.a11 + base.a22) / 2) ** 2, 1e-300);
  if (Math.abs(det2(shifted(base, mu))) <= 1e-10 * scale) mu *= 1 + 1e-6;
  return { ...base, forcing: { e1: d.extraV / l, mu } };
}

/** Output voltage and load current from the state. */
export function outputV(p: RlcLoop, x: Vec2): number {
  const k = 1 / (1 + p.esrOhm * p.loadConductanceS);
  return k * (x[1] + p.esrOhm * (x[0] - p.loadCurrentA));
}

/** Exact state x(t). */
export function stateAt(s: Linear2, x0: Vec2, t: number): Vec2 {
  return stateFrom(s, x0)(t);
}

/**
 * Exact state x(t) from x0 as a function of t, piece by piece (a held start, then the source's
 * decay): each piece's particular solution, forced part and natural part's start, which do not
 * depend on t, are computed once. The energy quadrature evaluates the state at up to 250,000
 * nodes a segment (turn-off-loop.ts); recomputing them there, about ten small objects a node for
 * each of four integrands, was 89 % of what a review call allocated (bench/results.json, row
 * review-allocation: 648 -> 133 MB a call with gaussLegendreEach).
 */
export function stateFrom(s: Linear2, x0: Vec2): (t: number) => Vec2 {
  const first = pieceStateFrom(s, x0);
  const n = s.next;
  if (n === undefined) return first;
  const rest = stateFrom(n.system, first(n.atS));
  return (t) => (t > n.atS ? rest(t - n.atS) : first(t));
}

/** Exact derivative x'(t). */
export function rateAt(s: Linear2, x0: Vec2, t: number): Vec2 {
  const n = s.next;
  if (n === undefined || !(t > n.atS)) return pieceRate(s, x0, t);
  return rateAt(n.system, pieceState(s, x0, n.atS), t - n.atS);
}

/** Exact ∫₀ᵗ x dt. */
export function stateIntegral(s: Linear2, x0: Vec2, t: number): Vec2 {
  const n = s.next;
  if (n === undefined || !(t > n.atS)) return pieceIntegral(s, x0, t);
  const a = pieceIntegral(s, x0, n.atS);
  const b = stateIntegral(n.system, pieceState(s, x0, n.atS), t - n.atS);
  return [a[0] + b[0], a[1] + b[1]];
}

/** Times in (0, tMax] where w·x'(t) = 0 (the extrema of w·x), ascending, at most maxCount (rlc-piece.ts pieceExtrema, piece by piece). */
export function extremaTimes(s: Linear2, x0: Vec2, w: Vec2, tMax: number, maxCount: number): number[] {
  const n = s.next;
  if (n === undefined || !(tMax > n.atS)) return pieceExtrema(s, x0, w, tMax, maxCount);
  const first = pieceExtrema(s, x0, w, n.atS, maxCount);
  if (first.length >= maxCount) return first;
  const later = extremaTimes(n.system, pieceState(s, x0, n.atS), w, tMax - n.atS, maxCount - first.length);
  return [...first, ...later.map((t) => t + n.atS)];
}

/** First time in [0, tMax] at which w·x(t) reaches `level`, or undefined (rlc-piece.ts pieceCrossing, piece by piece). */
export function firstCrossing(s: Linear2, x0: Vec2, w: Vec2, level: number, tMax: number): number | undefined {
  const n = s.next;
  if (n === undefined || !(tMax > n.atS)) return pieceCrossing(s, x0, w, level, tMax);
  const first = pieceCrossing(s, x0, w, level, n.atS);
  if (first !== undefined) return first;
  const later = firstCrossing(n.system, pieceState(s, x0, n.atS), w, level, tMax - n.atS);
  return later === undefined ? undefined : later + n.atS;
}

/** Composite 5-point Gauss-Legendre quadrature of f on [a, b] with n panels. */
export function gaussLegendre(f: (t: number) => number, a: number, b: number, n: number): number {
  return (
    gaussLegendreEach(
      (t, out) => {
        out[0] = f(t);
      },
      a,
      b,
      n,
      1,
    )[0] ?? 0
  );
}

const GL_X = [0, -0.5384693101056831, 0.5384693101056831, -0.906179845938664, 0.906179845938664];
const GL_W = [0.5688888888888889, 0.4786286704993665, 0.4786286704993665, 0.2369268850561891, 0.2369268850561891];

/**
 * The same quadrature of `count` integrands at once: `f` writes their values at a node into `out`
 * (one array for the whole quadrature), so integrands that share a costly part (the loop's state,
 * turn-off-loop.ts) evaluate it once a node. Each sum is formed at the same nodes in the same order
 * as for one integrand alone.
 */
export function gaussLegendreEach(
  f: (t: number, out: number[]) => void,
  a: number,
  b: number,
  n: number,
  count: number,
): number[] {
  const h = (b - a) / n;
  const sums: number[] = new Array<number>(count).fill(0);
  const v: number[] = new Array<number>(count).fill(0);
  for (let i = 0; i < n; i += 1) {
    const mid = a + (i + 0.5) * h;
    for (let j = 0; j < 5; j += 1) {
      f(mid + 0.5 * h * (GL_X[j] ?? 0), v);
      for (let k = 0; k < count; k += 1) sums[k] = (sums[k] ?? 0) + (GL_W[j] ?? 0) * (v[k] ?? 0);
    }
  }
  return sums.map((sum) => 0.5 * h * sum);
}
