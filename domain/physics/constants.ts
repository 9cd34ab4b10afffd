/** Physical constants, exact in the SI since 2019. */
export const BOLTZMANN_J_PER_K = 1.380649e-23;
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;
/** 0 °C in kelvin. */
export const ZERO_C_IN_K = 273.15;
/** The reference temperature of datasheet values, 25 °C, in kelvin. */
export const T25_K = 298.15;

/** Thermal voltage kT/q in volts at an absolute temperature in kelvin. */
export function thermalVoltageV(tK: number): number {
  return (BOLTZMANN_J_PER_K * tK) / ELEMENTARY_CHARGE_C;
}

export function cToK(tC: number): number {
  return tC + ZERO_C_IN_K;
}

export function kToC(tK: number): number {
  return tK - ZERO_C_IN_K;
}
