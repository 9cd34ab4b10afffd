import {
  type AcBridgeCircuit,
  type ForwardLaw,
  loadCurrentA,
  loadSlopeS,
  type PairLaws,
  type Snapshot,
  solveOutputV,
} from "./ac-bridge-circuit.js";
import type { LoadModel } from "./load-model.js";

/**
 * A Newton step x → next for a current in a junction's knee, where the residual is logarithmic
 * in the current: plain Newton creeps up by a factor 1 + ln(root/x) a step (or leaves the bracket
 * downwards); the same step taken in u = ln x (Newton on ln x: x·exp(Δ/x)) lands near the root
 * at once. Used where the plain step would more than double x or leave the bracket at lo; the
 * bracket still guards every step.
 */
function kneeStep(x: number, next: number, lo: number): number {
  if (!(x > 0) || !(next > 2 * x || next <= lo)) return next;
  return x * Math.exp(Math.max(-50, Math.min((next - x) / x, 50)));
}

/** g(i) of the stage without inductance (solveStage), for the bracket search. */
function gValue(
  la: ForwardLaw,
  lb: ForwardLaw,
  m: number,
  r: number,
  k: number,
  bv: number,
  load: LoadModel,
  i: number,
): number {
  const out = m - r * i - la.dropV(i) - lb.dropV(i);
  return out > 0 ? out + k * loadCurrentA(load, out) - k * i - bv : out - k * i - bv;
}

/** The node record of a stage solution (module-level: no closure per stage). */
function node(
  c: AcBridgeCircuit,
  t: number,
  e: number,
  i: number,
  s: 1 | -1 | 0,
  outV: number,
  dA: number,
  dB: number,
  inductorV: number,
  dCapAdB0: number,
  dCapAdB1: number,
  dVLdB0: number,
  dVLdB1: number,
): Snapshot {
  const loadA = loadCurrentA(c.load, outV);
  const capA = Math.abs(i) - loadA;
  return {
    t,
    sourceV: e,
    capV: outV - c.esrOhm * capA,
    lineA: i,
    outV,
    loadA,
    capA,
    pair: s,
    dropAV: dA,
    dropBV: dB,
    inductorV,
    dCapAdB0,
    dCapAdB1,
    dVLdB0,
    dVLdB1,
  };
}

/** Off-state output: v + k·ℓ(v) = b₀, so ∂v/∂b₀ = 1/(1 + k·ℓ'(v)) and ∂capA/∂b₀ = −ℓ'·∂v/∂b₀. */
function offSens(load: LoadModel, outV: number, k: number): number {
  const slope = loadSlopeS(load, outV);
  return -slope / (1 + k * slope);
}

/**
 * One implicit stage x − a·f(t, x) = b of a one-step method (a = 0: the algebraic state at x = b).
 * Without inductance x = [capV]: with source current of magnitude i through the pair picked by
 * the sign of e(t), outV = |e| − R·i − VA(i) − VB(i), and capV − a·iC/C = b reduces to
 * outV + k·ℓ(outV) − k·i = b with k = ESR + a/C, strictly decreasing in i: no conduction when it
 * is ≤ 0 at i = 0, else one root. With inductance x = [capV, i]: the capacitor equation gives outV
 * from |i| in closed form, and the inductor equation i − (a/L)·(e − R·i − sign(i)·(VA + VB + outV))
 * = b₁ is increasing in i with a jump at i = 0 (the blocking bridge): zero current inside the jump.
 * Undefined when the load cannot be held (outV would fall to zero): the caller shrinks the step.
 */
export function solveStage(
  c: AcBridgeCircuit,
  laws: PairLaws,
  t: number,
  a: number,
  b: readonly number[],
  hintA: number,
): Snapshot | undefined {
  const w = 2 * Math.PI * c.frequencyHz;
  const e = Math.SQRT2 * c.sourceRmsV * Math.sin(w * t);
  const r = c.sourceResistanceOhm;
  const cap = c.capacitanceF;
  const k = c.esrOhm + a / cap;
  const bv = b[0] ?? 0;
  const lh = c.leakageInductanceH;

  if (!(lh > 0)) {
    const off = solveOutputV(c.load, bv, k);
    if (off === undefined) return undefined;
    const m = Math.abs(e);
    const s: 1 | -1 = e >= 0 ? 1 : -1;
    const [la, lb] = s > 0 ? laws.positive : laws.negative;
    // Laws give the right-hand limit at zero current (a regulated drop starts at its setpoint).
    if (off >= m - la.dropV(0) - lb.dropV(0))
      return node(c, t, e, 0, 0, off, 0, 0, 0, offSens(c.load, off, k), 0, 0, 0);
    // g(i) = outV + k·ℓ(outV) − k·i − b: g(0) > 0, decreasing.
    // The same part in both positions: one law evaluation for the pair.
    const twin = la === lb;
    const load = c.load;
    // Upper bracket: at i = |e|/R the output would be at or below zero (KVL), where g < 0 for
    // b₀ ≥ 0 without an evaluation; else (no source resistance) found by doubling.
    let hi = r > 0 && bv >= 0 ? m / r : Math.max(Math.abs(hintA) * 2, (m - off) / Math.max(r + k, 1e-3), 1e-9);
    if (!(r > 0 && bv >= 0)) for (let n = 0; n < 200 && gValue(la, lb, m, r, k, bv, load, hi) > 0; n += 1) hi *= 2;
    // g(0) > 0 here (out(0) > off and v + k·ℓ(v) increases). Newton kept inside the shrinking
    // bracket, bisection where a step would leave it (safe-newton.ts's rule, written out here
    // so that no closure or tuple is made per evaluation).
    const tolI = 1e-13 * hi;
    let lo = 0;
    const hint = Math.abs(hintA);
    // Without a usable hint (the onset: none) from the left end, where g > 0 and, g being convex,
    // Newton rises to the root monotonically.
    let i = hint > lo && hint < hi ? hint : lo;
    for (let it = 0; it < 100; it += 1) {
      const va = la.dropV(i);
      const sa = la.slopeOhm(i);
      const vb = twin ? va : lb.dropV(i);
      const sb = twin ? sa : lb.slopeOhm(i);
      const out = m - r * i - va - vb;
      const rr = r + sa + sb;
      let f: number;
      let df: number;
      if (!(out > 0)) {
        f = out - k * i - bv;
        df = -rr - k;
      } else {
        f = out + k * loadCurrentA(load, out) - k * i - bv;
        df = -rr * (1 + k * loadSlopeS(load, out)) - k;
      }
      if (f === 0) break;
      if (f > 0) lo = i;
      else hi = i;
      const plain = df !== 0 ? i - f / df : Number.NaN;
      let next = kneeStep(i, plain, lo);
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      // Converged on a step below tolerance that is also small against the current itself: in
      // the knee the first steps from zero are far below tolI (Is-sized), and stopping there
      // left the stage's voltage equation volts from solved (a charge from nowhere at each
      // onset: the element averages fell 0.1-0.9 % short of the load's).
      const dI = Math.abs(next - i);
      if ((dI <= tolI && dI <= 1e-6 * next) || hi - lo <= tolI) {
        i = next;
        break;
      }
      i = next;
    }
    const va = la.dropV(i);
    const sa = la.slopeOhm(i);
    const vb = twin ? va : lb.dropV(i);
    const sb = twin ? sa : lb.slopeOhm(i);
    const outV = m - r * i - va - vb;
    if (!(outV > 0)) return undefined;
    // g(i; b₀) = 0: ∂i/∂b₀ = 1/g'(i); capA = i − ℓ(outV(i)), outV' = −(R + rA + rB).
    const rr = r + sa + sb;
    const slope = loadSlopeS(c.load, outV);
    const gp = -rr * (1 + k * slope) - k;
    return node(c, t, e, s * i, s, outV, va, vb, 0, (1 + slope * rr) / gp, 0, 0, 0);
  }

  const bi = b[1] ?? 0;
  if (a === 0) {
    // Algebraic state: the current is the state itself.
    const i = bi;
    const outV = solveOutputV(c.load, bv + c.esrOhm * Math.abs(i), c.esrOhm);
    if (outV === undefined) return undefined;
    const ov = 1 / (1 + c.esrOhm * loadSlopeS(c.load, outV));
    const slope = loadSlopeS(c.load, outV);
    if (i === 0) {
      const s: 1 | -1 = e >= 0 ? 1 : -1;
      const [la, lb] = s > 0 ? laws.positive : laws.negative;
      const drive = Math.abs(e) - outV - la.dropV(0) - lb.dropV(0);
      return node(c, t, e, 0, 0, outV, 0, 0, drive > 0 ? s * drive : 0, -slope * ov, 0, drive > 0 ? -s * ov : 0, 0);
    }
    const s: 1 | -1 = i > 0 ? 1 : -1;
    const [la, lb] = s > 0 ? laws.positive : laws.negative;
    const va = la.dropV(Math.abs(i));
    const sa = la.slopeOhm(Math.abs(i));
    const vb = lb.dropV(Math.abs(i));
    const sb = lb.slopeOhm(Math.abs(i));
    // outV from b₀ + ESR·|i|: ∂outV/∂b₀ = ov, ∂outV/∂b₁ = ESR·s·ov.
    return node(
      c,
      t,
      e,
      i,
      s,
      outV,
      va,
      vb,
      e - r * i - s * (va + vb + outV),
      -slope * ov,
      s - slope * c.esrOhm * s * ov,
      -s * ov,
      -r - sa - sb - c.esrOhm * ov,
    );
  }
  const al = a / lh;
  const out0 = solveOutputV(c.load, bv, k);
  if (out0 === undefined) return undefined;
  const q = al * e + bi;
  const onset = (p: readonly [ForwardLaw, ForwardLaw]): number => al * (out0 + p[0].dropV(0) + p[1].dropV(0));
  let s: 1 | -1 | 0 = 0;
  if (q > onset(laws.positive)) s = 1;
  else if (-q > onset(laws.negative)) s = -1;
  // Blocked: the current is held at zero, and so is its rate at this node (the stage's −b₁/a is
  // the jump that brought it there, not a rate; the sensitivity keeps it, so that ∂i/∂b = 0).
  if (s === 0) return node(c, t, e, 0, 0, out0, 0, 0, 0, offSens(c.load, out0, k), 0, 0, -1 / al);
  const sq = s * q;
  const [la, lb] = s > 0 ? laws.positive : laws.negative;
  const dk = (out: number): number => k / (1 + k * loadSlopeS(c.load, out));
  // h(x) = x + (a/L)·(R·x + VA + VB + outV(x)) − s·q for x = |i| > 0: increasing, h(0) < 0 ≤ h(sq).
  // Newton inside the shrinking bracket, bisection where a step would leave it (safe-newton.ts's
  // rule, written out: no closure or tuple per evaluation).
  let failed = false;
  const twin = la === lb;
  const load = c.load;
  const tolX = 1e-14 * sq;
  let lo = 0;
  let hi = sq;
  const hint = Math.abs(hintA);
  let x = hint > lo && hint < hi ? hint : 0.5 * (lo + hi);
  for (let it = 0; it < 100; it += 1) {
    const out = solveOutputV(load, bv + k * x, k);
    let f = 1;
    let df = 1;
    if (out === undefined) failed = true;
    else {
      const va = la.dropV(x);
      const sa = la.slopeOhm(x);
      const vb = twin ? va : lb.dropV(x);
      const sb = twin ? sa : lb.slopeOhm(x);
      f = x + al * (r * x + va + vb + out) - sq;
      df = 1 + al * (r + sa + sb + dk(out));
    }
    if (f === 0) break;
    if (f < 0) lo = x;
    else hi = x;
    const plain = df !== 0 ? x - f / df : Number.NaN;
    let next = kneeStep(x, plain, lo);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= tolX || hi - lo <= tolX) {
      x = next;
      break;
    }
    x = next;
  }
  const outV = solveOutputV(c.load, bv + k * x, k);
  if (failed || outV === undefined) return undefined;
  const va = la.dropV(x);
  const sa = la.slopeOhm(x);
  const vb = lb.dropV(x);
  const sb = lb.slopeOhm(x);
  // h(x; b) = 0 with ∂h/∂b₀ = (a/L)·ov, ∂h/∂b₁ = −s; outV = O(b₀ + k·x), ∂O = ov = 1/(1 + k·ℓ').
  const slope = loadSlopeS(c.load, outV);
  const ov = 1 / (1 + k * slope);
  const hx = 1 + al * (r + sa + sb + k * ov);
  const dx0 = (-al * ov) / hx;
  const dx1 = s / hx;
  const dOut0 = ov * (1 + k * dx0);
  const dOut1 = ov * k * dx1;
  return node(
    c,
    t,
    e,
    s * x,
    s,
    outV,
    va,
    vb,
    (s * x - bi) / al,
    dx0 - slope * dOut0,
    dx1 - slope * dOut1,
    (s * dx0) / al,
    (s * dx1 - 1) / al,
  );
}
