/**
 * A clamp (TVS) fed by a transient through the source resistance, in closed form.
 *
 * Source: Voc(t) = Ub + A·t/tr for 0 ≤ t < tr (a linear rise; tr = 0: a step), then
 * Ub + A·e^(−(t − tr)/τ). Clamp: v = Vbr + Rd·i for i > 0 (breakdown and dynamic resistance;
 * Rd = 0: the constant clamping voltage Vc = Vbr). The module's own load in parallel with the
 * clamp is folded into the source first (Thevenin): a resistance RL makes Ub, A scale by
 * RL/(Ri + RL) and Ri become Ri·RL/(Ri + RL); a constant current IL lowers Ub by Ri·IL. With
 * R = Ri' + Rd and B = Vbr − Ub' (0 < B < A):
 *   i(t) = (A·t/tr − B)/R on the rise (from t0 = tr·B/A), (A·e^(−s/τ) − B)/R on the decay (s = t − tr),
 *   Ipk = (A − B)/R,  decay conduction τ·ln(A/B),
 *   Q = (A − B)²·tr/(2·A·R) + (τ/R)·(A − B − B·ln(A/B)),
 *   ∫i² = (A − B)³·tr/(3·A·R²) + (τ/R²)·((A² − B²)/2 − 2·B·(A − B) + B²·ln(A/B)),
 *   E = Vbr·Q + Rd·∫i²  (the clamp's energy),
 * derivation: integrate i and i² over the two pieces (docs/references.md). Rd = 0, no load and
 * tr = 0 give the constant-Vc form Ipk = (A − B)/Ri, Q = (τ/Ri)·(A − B − B·ln(A/B)), E = Vc·Q.
 * The tests check it against numerical integration and against ngspice on the same circuit.
 */
export interface ExponentialPulse {
  /** Supply the pulse rides on, V (0 for a pulse with the supply disconnected). */
  readonly baseV: number;
  /** Amplitude above the base, V (> 0; give the magnitude for negative pulses). */
  readonly amplitudeV: number;
  readonly tauS: number;
  readonly sourceResistanceOhm: number;
  /** Linear rise to the peak, s (default 0: a step). */
  readonly riseS?: number;
}

/** The clamp's law: v = breakdownV + dynamicOhm·i for i > 0. */
export interface ClampLaw {
  readonly breakdownV: number;
  readonly dynamicOhm: number;
}

/** The module's load in parallel with the clamp during the pulse. */
export type ParallelLoad =
  | { readonly kind: "resistive"; readonly resistanceOhm: number }
  | { readonly kind: "constant-current"; readonly currentA: number };

export type ClampResult =
  | { readonly conducts: false; readonly peakOpenCircuitV: number }
  | {
      readonly conducts: true;
      readonly peakCurrentA: number;
      readonly conductionTimeS: number;
      readonly chargeC: number;
      readonly energyJ: number;
      readonly averagePowerW: number;
      /** Clamp voltage at the peak current, Vbr + Rd·Ipk, V. */
      readonly peakClampV: number;
      /** Peak power in the clamp, peakClampV·Ipk, W. */
      readonly peakPowerW: number;
      /** Time from the current's peak to half of it, s: the pulse width its power rating is read at. */
      readonly currentHalfWidthS: number;
      /** Energy into the parallel load while the clamp conducts, J (0 without a load). */
      readonly loadEnergyJ: number;
    }
  | { readonly conducts: "always"; readonly reason: string };

export function clampExponential(p: ExponentialPulse, clampV: number): ClampResult {
  return clampPulse(p, { breakdownV: clampV, dynamicOhm: 0 });
}

export function clampPulse(p: ExponentialPulse, law: ClampLaw, load?: ParallelLoad): ClampResult {
  let ub = p.baseV;
  let a = p.amplitudeV;
  let ri = p.sourceResistanceOhm;
  if (load?.kind === "resistive") {
    const k = load.resistanceOhm / (ri + load.resistanceOhm);
    ub *= k;
    a *= k;
    ri *= k;
  } else if (load?.kind === "constant-current") {
    ub -= ri * load.currentA;
  }
  const b = law.breakdownV - ub;
  if (b <= 0)
    return {
      conducts: "always",
      reason: `the clamp's breakdown ${law.breakdownV} V is not above the ${round(ub)} V the pulse rides on at the clamp: it would conduct the supply`,
    };
  if (a <= b) return { conducts: false, peakOpenCircuitV: ub + a };
  const r = ri + law.dynamicOhm;
  const tr = p.riseS ?? 0;
  const tau = p.tauS;
  const ln = Math.log(a / b);
  const d = a - b;
  const chargeC = (d * d * tr) / (2 * a * r) + (tau / r) * (d - b * ln);
  const i2 = (d * d * d * tr) / (3 * a * r * r) + (tau / (r * r)) * ((a * a - b * b) / 2 - 2 * b * d + b * b * ln);
  const conductionTimeS = tr * (d / a) + tau * ln;
  const energyJ = law.breakdownV * chargeC + law.dynamicOhm * i2;
  const peakCurrentA = d / r;
  const peakClampV = law.breakdownV + law.dynamicOhm * peakCurrentA;
  // ∫v dt and ∫v² dt over the conduction, for the load's share.
  const vdt = law.breakdownV * conductionTimeS + law.dynamicOhm * chargeC;
  const v2dt =
    law.breakdownV * law.breakdownV * conductionTimeS +
    2 * law.breakdownV * law.dynamicOhm * chargeC +
    law.dynamicOhm * law.dynamicOhm * i2;
  const loadEnergyJ =
    load === undefined ? 0 : load.kind === "resistive" ? v2dt / load.resistanceOhm : load.currentA * vdt;
  return {
    conducts: true,
    peakCurrentA,
    conductionTimeS,
    chargeC,
    energyJ,
    averagePowerW: energyJ / conductionTimeS,
    peakClampV,
    peakPowerW: peakClampV * peakCurrentA,
    currentHalfWidthS: tau * Math.log((2 * a) / (a + b)),
    loadEnergyJ,
  };
}

/**
 * τ from a decay time: "to-10-percent" reads td as the time to fall to 10 % (τ = td/ln 10),
 * "to-50-percent" as the time to half value (τ = td/ln 2, a surge's tail).
 */
export function tauFromDecay(decayS: number, convention: "to-10-percent" | "to-50-percent" | "time-constant"): number {
  if (convention === "to-10-percent") return decayS / Math.LN10;
  return convention === "to-50-percent" ? decayS / Math.LN2 : decayS;
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
