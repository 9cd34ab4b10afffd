import { kToC } from "../physics/constants.js";
import { SLOT, circuitMetrics, elementMetrics } from "./bridge-ac-metrics.js";
import { acPeriodWaveform } from "./bridge-ac-waveform.js";
import {
  BRIDGE_POSITIONS,
  type BridgePosition,
  elementLaw,
  elementReverseRatingV,
  elementTjMaxC,
} from "./bridge-element.js";
import type { Isothermal } from "./bridge-ac.js";
import type { AcElementResult, AcSteadyState, BridgeAcModel } from "./bridge-ac-types.js";

/** Assemble the reported steady state from an isothermal solution. */
export function steadyStateOf(
  m: BridgeAcModel,
  iso: Isothermal,
  temps: Readonly<Record<BridgePosition, number>>,
  counts: { readonly thermalIterations: number; readonly periods: number },
  waveformPoints?: number,
): AcSteadyState {
  const period = 1 / m.frequencyHz;
  const circuit = circuitMetrics(iso.integrals, period, m.sourceRmsV, iso.storedJ);
  const elements = BRIDGE_POSITIONS.map((position): AcElementResult => {
    const e = m.elements[position];
    return {
      position,
      mode: elementLaw(e, temps[position], circuit.dcOutputV).mode,
      ...elementMetrics(iso.integrals, SLOT[position], period, iso.trace),
      tjC: kToC(temps[position]),
      tjMaxC: elementTjMaxC(e),
      reverseRatingV: elementReverseRatingV(e),
    };
  });
  return {
    ...circuit,
    elements,
    totalElementLossW: elements.reduce((s, e) => s + e.lossW, 0),
    solver: {
      shootingIterations: iso.iterations,
      periodsIntegrated: counts.periods,
      stepsLastPeriod: iso.steps,
      thermalIterations: counts.thermalIterations,
    },
    ...(waveformPoints === undefined ? {} : { waveform: acPeriodWaveform(iso.trace, period, waveformPoints) }),
  };
}
