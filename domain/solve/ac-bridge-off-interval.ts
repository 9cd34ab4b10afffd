import type { AcBridgeCircuit, Snapshot } from "./ac-bridge-circuit.js";
import { safeNewton } from "./safe-newton.js";

/**
 * While no pair conducts, the reservoir only discharges into the load: C·d(capV)/dt = −ℓ(outV),
 * outV = capV − ESR·ℓ(outV). For a resistive load that is the exponential
 * outV(s) = outV₀·e^(−s/τ), τ = (R + ESR)·C; for a constant current the line
 * outV(s) = outV₀ − (I/C)·s (closed forms of the linear RC discharge). Both are exact: the
 * integrator steps across the whole off interval at once. A constant-power load has no closed
 * form here (undefined: the general steps).
 */
export interface OffDecay {
  readonly kind: "resistive" | "constant-current";
  /** τ = (R + ESR)·C, s (resistive), or the slope I/C, V/s (constant current). */
  readonly rate: number;
  readonly loadOhm: number;
  readonly currentA: number;
}

export function offDecayOf(c: AcBridgeCircuit): OffDecay | undefined {
  const l = c.load;
  if (l.kind === "resistive")
    return {
      kind: "resistive",
      rate: (l.resistanceOhm + c.esrOhm) * c.capacitanceF,
      loadOhm: l.resistanceOhm,
      currentA: 0,
    };
  if (l.kind === "constant-current")
    return { kind: "constant-current", rate: l.currentA / c.capacitanceF, loadOhm: 0, currentA: l.currentA };
  return undefined;
}

/** Output voltage a time s into the off interval from outV₀, V (≤ 0: the load has collapsed the reservoir). */
export function offOutV(d: OffDecay, out0: number, s: number): number {
  return d.kind === "resistive" ? out0 * Math.exp(-s / d.rate) : out0 - d.rate * s;
}

/** d(outV)/ds and d²(outV)/ds² at outV. */
function offSlope(d: OffDecay, out: number): number {
  return d.kind === "resistive" ? -out / d.rate : -d.rate;
}
function offCurvature(d: OffDecay, out: number): number {
  return d.kind === "resistive" ? out / (d.rate * d.rate) : 0;
}

/** ∂capV(s)/∂capV(0) over the interval (capV is proportional to outV or offset from it by ESR·I). */
export function offGain(d: OffDecay, s: number): number {
  return d.kind === "resistive" ? Math.exp(-s / d.rate) : 1;
}

/** ∫₀ˢ outV and ∫₀ˢ outV² over the interval (closed forms of the exponential or the line). */
export function offMoments(d: OffDecay, out0: number, s: number): { readonly vS: number; readonly v2S: number } {
  if (d.kind === "resistive") {
    const tau = d.rate;
    return { vS: -out0 * tau * Math.expm1(-s / tau), v2S: -0.5 * out0 * out0 * tau * Math.expm1((-2 * s) / tau) };
  }
  const a = d.rate;
  return { vS: out0 * s - 0.5 * a * s * s, v2S: out0 * out0 * s - out0 * a * s * s + (a * a * s * s * s) / 3 };
}

/**
 * First time in (t0, t1] at which a pair starts to conduct: m(t) = |e(t)| − VA(0) − VB(0) −
 * outV(t − t0) rises through zero (the stage's onset condition with no current). Within a
 * half-cycle |e| is concave and the decay −outV is concave, so m is concave: its maximum (root
 * of m′, or an end) decides whether there is a crossing, and m rises monotonically up to it (one
 * root), reached by Newton from below. The interval lies within a half-cycle (the integrator's breakpoints are the zero
 * crossings). Returns the root's lower bracket (the node there is still off) or undefined.
 */
export function onsetS(
  c: AcBridgeCircuit,
  d: OffDecay,
  t0: number,
  t1: number,
  out0: number,
  dropAtZeroV: number,
): number | undefined {
  const w = 2 * Math.PI * c.frequencyHz;
  const amp = Math.SQRT2 * c.sourceRmsV;
  const sign = Math.sin(w * (0.5 * (t0 + t1))) >= 0 ? 1 : -1;
  const m = (t: number): number => sign * amp * Math.sin(w * t) - dropAtZeroV - offOutV(d, out0, t - t0);
  const dm = (t: number): readonly [number, number] => {
    const out = offOutV(d, out0, t - t0);
    return [
      sign * amp * w * Math.cos(w * t) - offSlope(d, out),
      -sign * amp * w * w * Math.sin(w * t) - offCurvature(d, out),
    ];
  };
  const tol = 1e-13 / c.frequencyHz;
  const d0 = dm(t0)[0];
  const d1 = dm(t1)[0];
  const peak = d1 >= 0 ? t1 : d0 <= 0 ? t0 : safeNewton(dm, t0, t1, d0, 0.5 * (t0 + t1), tol);
  const mPeak = m(peak);
  if (!(mPeak > 0)) return undefined;
  const mLo = m(t0);
  if (mLo > 0) return t0;
  // Newton from the off side: m is concave and rising on [t0, peak], so every tangent root lies
  // at or before the crossing and the iterates rise to it monotonically, staying off.
  let t = t0;
  let f = mLo;
  for (let k = 0; k < 60; k += 1) {
    const slope = dm(t)[0];
    if (!(slope > 0)) break;
    const next = Math.min(peak, t - f / slope);
    const fn = m(next);
    if (fn > 0 || next - t <= tol) return fn > 0 ? t : next;
    t = next;
    f = fn;
  }
  return t;
}

/** The off node at time t (no current, the output from the decay; the stage's a = 0 sensitivity). */
export function offNode(c: AcBridgeCircuit, d: OffDecay, t: number, outV: number): Snapshot {
  const e = Math.SQRT2 * c.sourceRmsV * Math.sin(2 * Math.PI * c.frequencyHz * t);
  const loadA = d.kind === "resistive" ? outV / d.loadOhm : d.currentA;
  const slope = d.kind === "resistive" ? 1 / d.loadOhm : 0;
  const capA = -loadA;
  return {
    t,
    sourceV: e,
    capV: outV - c.esrOhm * capA,
    lineA: 0,
    outV,
    loadA,
    capA,
    pair: 0,
    dropAV: 0,
    dropBV: 0,
    inductorV: 0,
    dCapAdB0: -slope / (1 + c.esrOhm * slope),
    dCapAdB1: 0,
    dVLdB0: 0,
    dVLdB1: 0,
  };
}
