import type { Snapshot } from "../solve/ac-bridge-circuit.js";
import type { ElementSlot, PeriodIntegrals } from "../solve/ac-bridge-period-types.js";
import type { BridgePosition } from "./bridge-element.js";

/** Slot of each position in the period accumulators: positive pair 0, 1; negative pair 2, 3. */
export const SLOT: Readonly<Record<BridgePosition, ElementSlot>> = {
  line1High: 0,
  line2Low: 1,
  line2High: 2,
  line1Low: 3,
};

/** Conduction threshold as a fraction of the element's peak current (the diode law never reaches zero exactly). */
export const CONDUCTION_THRESHOLD = 1e-3;

export interface AcCircuitMetrics {
  readonly dcOutputV: number;
  readonly rippleVpp: number;
  readonly outputMinV: number;
  readonly outputMaxV: number;
  readonly loadCurrentA: number;
  readonly loadPowerW: number;
  readonly capacitorRippleCurrentRmsA: number;
  readonly esrLossW: number;
  readonly sourceRmsCurrentA: number;
  readonly sourcePeakCurrentA: number;
  /** Power the source EMF delivers, W. */
  readonly sourcePowerW: number;
  readonly sourceResistanceLossW: number;
  /** Power into the bridge terminals (source power less source-resistance loss), W. */
  readonly bridgeInputPowerW: number;
  /** P / (Vrms·Irms) at the source EMF. */
  readonly sourcePowerFactor: number;
  /** Load power / bridge input power. */
  readonly efficiency: number;
  readonly energyBalance: {
    readonly sourceEnergyJ: number;
    readonly loadEnergyJ: number;
    readonly elementEnergyJ: number;
    readonly resistanceEnergyJ: number;
    readonly storedEnergyChangeJ: number;
    /** |source − (load + elements + resistances + stored change)| / source. */
    readonly relativeResidual: number;
  };
}

export interface AcElementMetrics {
  readonly averageCurrentA: number;
  readonly rmsCurrentA: number;
  readonly peakCurrentA: number;
  readonly conductionAngleDeg: number;
  readonly lossW: number;
  readonly maxReverseV: number;
}

/** Period averages and RMS values from the integrals of the converged period. */
export function circuitMetrics(
  g: PeriodIntegrals,
  periodS: number,
  sourceRmsV: number,
  stored: { readonly capacitorJ: number; readonly inductorJ: number },
): AcCircuitMetrics {
  const elementEnergyJ = g.elementEnergyJ.reduce((s, v) => s + v, 0);
  const resistanceEnergyJ = g.sourceResistanceEnergyJ + g.esrEnergyJ;
  const storedEnergyChangeJ = stored.capacitorJ + stored.inductorJ;
  const balance = g.sourceEnergyJ - (g.loadEnergyJ + elementEnergyJ + resistanceEnergyJ + storedEnergyChangeJ);
  const sourceRmsCurrentA = Math.sqrt(g.lineA2s / periodS);
  const sourcePowerW = g.sourceEnergyJ / periodS;
  const bridgeInputPowerW = (g.sourceEnergyJ - g.sourceResistanceEnergyJ - g.inductorEnergyJ) / periodS;
  const apparent = sourceRmsV * sourceRmsCurrentA;
  return {
    dcOutputV: g.outVs / periodS,
    rippleVpp: g.outMaxV - g.outMinV,
    outputMinV: g.outMinV,
    outputMaxV: g.outMaxV,
    loadCurrentA: g.loadAs / periodS,
    loadPowerW: g.loadEnergyJ / periodS,
    capacitorRippleCurrentRmsA: Math.sqrt(g.capA2s / periodS),
    esrLossW: g.esrEnergyJ / periodS,
    sourceRmsCurrentA,
    sourcePeakCurrentA: g.lineMaxA,
    sourcePowerW,
    sourceResistanceLossW: g.sourceResistanceEnergyJ / periodS,
    bridgeInputPowerW,
    sourcePowerFactor: apparent > 0 ? sourcePowerW / apparent : 0,
    efficiency: bridgeInputPowerW > 0 ? g.loadEnergyJ / periodS / bridgeInputPowerW : 0,
    energyBalance: {
      sourceEnergyJ: g.sourceEnergyJ,
      loadEnergyJ: g.loadEnergyJ,
      elementEnergyJ,
      resistanceEnergyJ,
      storedEnergyChangeJ,
      relativeResidual: g.sourceEnergyJ > 0 ? Math.abs(balance) / g.sourceEnergyJ : 0,
    },
  };
}

export function elementMetrics(
  g: PeriodIntegrals,
  slot: ElementSlot,
  periodS: number,
  trace: readonly Snapshot[],
): AcElementMetrics {
  const peak = g.elementPeakA[slot] ?? 0;
  return {
    averageCurrentA: (g.elementAs[slot] ?? 0) / periodS,
    rmsCurrentA: Math.sqrt((g.elementA2s[slot] ?? 0) / periodS),
    peakCurrentA: peak,
    conductionAngleDeg: (360 * conductionTimeS(trace, slot < 2 ? 1 : -1, CONDUCTION_THRESHOLD * peak)) / periodS,
    lossW: (g.elementEnergyJ[slot] ?? 0) / periodS,
    maxReverseV: g.elementMaxReverseV[slot] ?? 0,
  };
}

/** Time the pair `pair` carries more than thresholdA, crossings placed by linear interpolation. */
function conductionTimeS(trace: readonly Snapshot[], pair: 1 | -1, thresholdA: number): number {
  if (!(thresholdA > 0)) return 0;
  const current = (s: Snapshot): number => (s.pair === pair ? Math.abs(s.lineA) : 0);
  let total = 0;
  for (let k = 1; k < trace.length; k += 1) {
    const a = trace[k - 1];
    const b = trace[k];
    if (a === undefined || b === undefined) continue;
    const dt = b.t - a.t;
    const ca = current(a) - thresholdA;
    const cb = current(b) - thresholdA;
    if (ca > 0 && cb > 0) total += dt;
    else if (ca > 0 || cb > 0) total += (dt * Math.max(ca, cb)) / Math.abs(cb - ca);
  }
  return total;
}
