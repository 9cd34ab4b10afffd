import { T25_K, thermalVoltageV } from "./constants.js";
import { wrightOmega } from "./lambert-w.js";

/**
 * Shockley diode with ideality factor and series resistance, and the SPICE level-1 temperature
 * law of the saturation current.
 *
 *   I = Is(T)·(exp((V − I·Rs)/(n·Vt)) − 1),  Vt = kT/q
 *   Is(T) = Is(T0)·(T/T0)^(XTI/n)·exp((Eg/(n·Vt(T)))·(T/T0 − 1))
 *
 * The second line is the saturation-current law of the SPICE level-1 diode (as in ngspice's
 * diode model, with Eg held constant and no Rs temperature coefficient).
 */
export interface DiodeParams {
  /** Saturation current at the nominal temperature, A. */
  readonly saturationCurrentA: number;
  /** Ideality (emission) coefficient n, dimensionless. */
  readonly ideality: number;
  /** Series resistance, ohm. */
  readonly seriesResistanceOhm: number;
  /** Activation energy Eg, eV (silicon 1.11, Schottky about 0.69). */
  readonly energyGapEv: number;
  /** Saturation-current temperature exponent XTI (PN 3, Schottky 2). */
  readonly saturationTempExponent: number;
  /** Temperature at which saturationCurrentA holds, K. */
  readonly nominalTempK: number;
  /**
   * Optional linear forward-voltage temperature coefficient at constant current, V/K (about
   * −2 mV/K for silicon, memory). When given it replaces the Eg/XTI law: the forward curve shifts
   * by tc·(T − T0) and the slope n·Vt stays at its T0 value, i.e. Is(T) = Is0·e^(−tc·(T − T0)/(n·Vt0)).
   */
  readonly linearTempCoVPerK?: number;
}

/** n·Vt of the junction at tK: the emission voltage of the exponential (held at T0 under a linear law). */
export function emissionVoltageV(p: DiodeParams, tK: number): number {
  return p.ideality * thermalVoltageV(p.linearTempCoVPerK === undefined ? tK : p.nominalTempK);
}

/** Saturation current at the absolute temperature tK, A. */
export function saturationCurrentAt(p: DiodeParams, tK: number): number {
  if (p.linearTempCoVPerK !== undefined) {
    return (
      p.saturationCurrentA *
      Math.exp((-p.linearTempCoVPerK * (tK - p.nominalTempK)) / emissionVoltageV(p, p.nominalTempK))
    );
  }
  const ratio = tK / p.nominalTempK;
  const vt = thermalVoltageV(tK);
  // (T/T0)^(XTI/n)·exp(Eg/(n·Vt)·(T/T0 − 1)) as one exponential of the summed logs: the same law,
  // one transcendental call fewer than Math.pow and exp (every circuit solve of every stage).
  return (
    p.saturationCurrentA *
    Math.exp(
      (p.saturationTempExponent / p.ideality) * Math.log(ratio) + (p.energyGapEv / (p.ideality * vt)) * (ratio - 1),
    )
  );
}

/** Forward voltage at forward current currentA (≥ 0) and temperature tK: explicit. */
export function diodeVoltageV(p: DiodeParams, currentA: number, tK: number): number {
  return forwardVoltageAtV(diodeAt(p, tK), currentA);
}

/**
 * Forward current at terminal voltage voltageV and temperature tK, exact through the Lambert W
 * function (T. C. Banwell and A. Jayakumar, Electronics Letters 36(4), 2000):
 *   I = (n·Vt/Rs)·W0((Is·Rs/(n·Vt))·exp((V + Is·Rs)/(n·Vt))) − Is,
 * evaluated as (n·Vt/Rs)·ω(x) − Is with x the log of W's argument, so large V cannot overflow.
 */
export function diodeCurrentA(p: DiodeParams, voltageV: number, tK: number): number {
  return forwardCurrentAtA(diodeAt(p, tK), voltageV);
}

/**
 * A diode's constants at one junction temperature: Is(T), n·Vt and Rs. The temperature law costs
 * a power and an exponential; a stage that evaluates the same junction at several currents or
 * voltages (a gate-drive iteration, a channel with its body diode) forms this once.
 */
export interface DiodeAtT {
  readonly saturationCurrentA: number;
  readonly emissionVoltageV: number;
  readonly seriesResistanceOhm: number;
}

export function diodeAt(p: DiodeParams, tK: number): DiodeAtT {
  return {
    saturationCurrentA: saturationCurrentAt(p, tK),
    emissionVoltageV: emissionVoltageV(p, tK),
    seriesResistanceOhm: p.seriesResistanceOhm,
  };
}

/** V = n·Vt·ln(I/Is + 1) + I·Rs at the junction's temperature (diodeVoltageV's formula). */
export function forwardVoltageAtV(d: DiodeAtT, currentA: number): number {
  return d.emissionVoltageV * Math.log1p(currentA / d.saturationCurrentA) + currentA * d.seriesResistanceOhm;
}

/** I(V) through Lambert W at the junction's temperature (diodeCurrentA's formula, Banwell and Jayakumar 2000). */
export function forwardCurrentAtA(d: DiodeAtT, voltageV: number): number {
  const is = d.saturationCurrentA;
  const nvt = d.emissionVoltageV;
  const rs = d.seriesResistanceOhm;
  if (rs <= 0) return is * Math.expm1(voltageV / nvt);
  const x = Math.log((is * rs) / nvt) + (voltageV + is * rs) / nvt;
  return (nvt / rs) * wrightOmega(x) - is;
}

/** Small-signal slope dV/dI of the diode at current currentA, ohm. */
export function diodeSlopeOhm(p: DiodeParams, currentA: number, tK: number): number {
  const is = saturationCurrentAt(p, tK);
  return emissionVoltageV(p, tK) / (currentA + is) + p.seriesResistanceOhm;
}

/** Defaults of the SPICE level-1 law by junction type [common practice]. */
export const JUNCTION_DEFAULTS = {
  pn: { energyGapEv: 1.11, saturationTempExponent: 3 },
  schottky: { energyGapEv: 0.69, saturationTempExponent: 2 },
} as const;

export const DEFAULT_NOMINAL_TEMP_K = T25_K;
