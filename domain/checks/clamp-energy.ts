/**
 * A clamp (TVS) fed by an exponentially decaying transient through the source resistance:
 *   Voc(t) = Ub + A·e^(−t/τ),  clamped at Vc, B = Vc − Ub (0 < B < A),
 *   Ipk = (A − B)/Ri,  tc = τ·ln(A/B),  Q = (τ/Ri)·(A − B − B·ln(A/B)),  E = Vc·Q.
 * Derivation in docs/references.md (integrate i(t) = (Voc(t) − Vc)/Ri while it is positive); the test
 * checks it against numerical integration.
 */
export interface ExponentialPulse {
  /** Supply the pulse rides on, V (0 for a pulse with the supply disconnected). */
  readonly baseV: number;
  /** Amplitude above the base, V (> 0; give the magnitude for negative pulses). */
  readonly amplitudeV: number;
  readonly tauS: number;
  readonly sourceResistanceOhm: number;
}

export type ClampResult =
  | { readonly conducts: false; readonly peakOpenCircuitV: number }
  | {
      readonly conducts: true;
      readonly peakCurrentA: number;
      readonly conductionTimeS: number;
      readonly chargeC: number;
      readonly energyJ: number;
      readonly averagePowerW: number;
    }
  | { readonly conducts: "always"; readonly reason: string };

export function clampExponential(p: ExponentialPulse, clampV: number): ClampResult {
  const a = p.amplitudeV;
  const b = clampV - p.baseV;
  if (b <= 0) return { conducts: "always", reason: `the clamp voltage ${clampV} V is not above the ${p.baseV} V the pulse rides on: it would conduct the supply` };
  if (a <= b) return { conducts: false, peakOpenCircuitV: p.baseV + a };
  const ln = Math.log(a / b);
  const chargeC = (p.tauS / p.sourceResistanceOhm) * (a - b - b * ln);
  const conductionTimeS = p.tauS * ln;
  const energyJ = clampV * chargeC;
  return { conducts: true, peakCurrentA: (a - b) / p.sourceResistanceOhm, conductionTimeS, chargeC, energyJ, averagePowerW: energyJ / conductionTimeS };
}

/**
 * τ from a decay time: "to-10-percent" reads td as the time to fall to 10 % (τ = td/ln 10),
 * "to-50-percent" as the time to half value (τ = td/ln 2, a surge's tail).
 */
export function tauFromDecay(decayS: number, convention: "to-10-percent" | "to-50-percent" | "time-constant"): number {
  if (convention === "to-10-percent") return decayS / Math.LN10;
  return convention === "to-50-percent" ? decayS / Math.LN2 : decayS;
}
