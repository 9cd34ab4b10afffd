import { BOLTZMANN_J_PER_K, ELEMENTARY_CHARGE_C } from "./constants.js";

/** Boltzmann's constant in eV/K (k/q). */
const K_EV_PER_K = BOLTZMANN_J_PER_K / ELEMENTARY_CHARGE_C;

/**
 * Reverse leakage of a Schottky junction by thermionic emission over its barrier ΦB (common
 * practice; S. M. Sze and K. K. Ng, Physics of Semiconductor Devices, 3rd ed., 2007, §3.3: the
 * saturation current density is A**·T²·exp(−q·ΦB/(k·T))), referred to one datasheet point:
 *
 *   I_R(T, V_R) = I_ref·(T/T_ref)²·exp(−(ΦB/k)·(1/T − 1/T_ref))·(V_R/V_ref)^m
 *
 * The reverse-voltage power m is empirical (image-force barrier lowering and edge leakage make a
 * real Schottky's leakage rise with V_R; m = 0 is the ideal saturated diode).
 */
export interface LeakageLaw {
  readonly refCurrentA: number;
  readonly refTempK: number;
  readonly refVoltageV: number;
  /** Barrier height ΦB, eV. */
  readonly barrierEv: number;
  /** Reverse-voltage power m, dimensionless. */
  readonly voltageExponent: number;
}

/**
 * Barrier height a Schottky's leakage law takes when the caller gives none, eV (memory: silicon
 * power Schottky barriers lie about 0.5–0.8 eV, Sze & Ng ch. 3 tables; 0.7 eV is taken toward the
 * steep end, so leakage carried from a cool datasheet figure to a hot junction errs high).
 */
export const DEFAULT_SCHOTTKY_BARRIER_EV = 0.7;

/** ln(I_R/I_ref) of the law at (tK, reverseV); reverseV > 0. */
export function leakageLogRatio(law: LeakageLaw, tK: number, reverseV: number): number {
  const voltage = law.voltageExponent === 0 ? 0 : law.voltageExponent * Math.log(reverseV / law.refVoltageV);
  return 2 * Math.log(tK / law.refTempK) - (law.barrierEv / K_EV_PER_K) * (1 / tK - 1 / law.refTempK) + voltage;
}

/** Reverse leakage current at junction temperature tK and reverse voltage reverseV, A (0 at no reverse bias). */
export function leakageCurrentA(law: LeakageLaw, tK: number, reverseV: number): number {
  if (!(reverseV > 0)) return 0;
  return law.refCurrentA * Math.exp(leakageLogRatio(law, tK, reverseV));
}
