import type { DiodeParams } from "../../domain/physics/diode.js";
import type { BridgeAcModel } from "../../domain/checks/bridge-ac.js";
import type { BridgeElements } from "../../domain/checks/bridge-element.js";
import type { DiodeStage, IdealDiodeStage } from "../../domain/stages/stage-model.js";

/** Invented demo parts for bridge tests (not real parts; the checks compare models, not parts). */
export const demoPn: DiodeParams = {
  saturationCurrentA: 1e-9,
  ideality: 1.8,
  seriesResistanceOhm: 0.02,
  energyGapEv: 1.11,
  saturationTempExponent: 3,
  nominalTempK: 298.15,
};

export function diodeElement(d: DiodeParams = demoPn, rthJaKPerW = 40): DiodeStage {
  return {
    kind: "pn-diode",
    diode: d,
    reverseRatingV: 100,
    tjMaxC: 150,
    thermal: { kind: "junction-ambient", rthJaKPerW },
  };
}

export function activeElement(
  o: { rdsOnOhm?: number; startV?: number; rthJaKPerW?: number; regulatedDropV?: number; body?: DiodeParams } = {},
): IdealDiodeStage {
  return {
    kind: "nfet-ideal-diode",
    mosfet: {
      channel: {
        rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: o.rdsOnOhm ?? 0.02 }],
        thresholdV: 2,
        tempLaw: { law: "power", exponent: 2.3 },
      },
      bodyDiode: o.body ?? demoPn,
      vdsMaxV: 60,
      vgsMaxV: 20,
      tjMaxC: 150,
    },
    controller: {
      startV: o.startV ?? 0,
      gateDrive: [{ inputV: 0, gateSourceV: 12 }],
      regulatedDropV: o.regulatedDropV ?? 0,
      quiescentA: 0,
      gateReleaseFraction: 0,
    },
    thermal: { kind: "junction-ambient", rthJaKPerW: o.rthJaKPerW ?? 40 },
  };
}

export function uniform<E extends BridgeElements[keyof BridgeElements]>(e: E): BridgeElements {
  return { line1High: e, line2High: e, line1Low: e, line2Low: e };
}

/** Demo AC bridge: a 24 V AC controller input, 2200 µF reservoir, 20 Ω load (invented); `o` overrides. */
export function demoBridgeAc(elements: BridgeElements, o: Partial<BridgeAcModel> = {}): BridgeAcModel {
  return {
    elements,
    sourceRmsV: 24,
    frequencyHz: 50,
    sourceResistanceOhm: 0.5,
    leakageInductanceH: 0,
    capacitanceF: 2200e-6,
    esrOhm: 0.05,
    load: { kind: "resistive", resistanceOhm: 20 },
    ambientC: 25,
    ...o,
  };
}
