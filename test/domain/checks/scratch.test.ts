import { it } from "vitest";
import { type BridgeAcModel, solveBridgeAcAt, steadyStateOf } from "../../../domain/checks/bridge-ac.js";
import type { DiodeStage, IdealDiodeStage } from "../../../domain/stages/stage-model.js";
import { bridgeNetlist, reduceBridgeRows, type SpiceBridge } from "../../helpers/bridge-spice.js";
import { runNgspice } from "../../helpers/ngspice.js";

const dp = { saturationCurrentA: 1e-9, ideality: 1.8, seriesResistanceOhm: 0.02, energyGapEv: 1.11, saturationTempExponent: 3, nominalTempK: 298.15 };
const diode: DiodeStage = { kind: "pn-diode", diode: dp, reverseRatingV: 100, tjMaxC: 150, thermal: { kind: "junction-ambient", rthJaKPerW: 40 } };
const fet: IdealDiodeStage = {
  kind: "nfet-ideal-diode",
  mosfet: { channel: { rdsOnPoints: [{ gateSourceV: 10, rdsOnOhm: 0.02 }], thresholdV: 2, tempLaw: { law: "power", exponent: 2.3 } }, bodyDiode: dp, vdsMaxV: 60, vgsMaxV: 20, tjMaxC: 150 },
  controller: { startV: 0, gateDrive: [{ inputV: 0, gateSourceV: 12 }], regulatedDropV: 0, quiescentA: 0, gateReleaseFraction: 0 },
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
};
const T = 298.15;
const temps = { line1High: T, line2High: T, line1Low: T, line2Low: T };
it("scratch", () => {
  for (const [el, sw, L] of [[diode, undefined, 0], [fet, 0.02, 0], [diode, undefined, 2e-3]] as const) {
    const m: BridgeAcModel = {
      elements: { line1High: el, line2High: el, line1Low: el, line2Low: el },
      sourceRmsV: 24, frequencyHz: 50, sourceResistanceOhm: 0.5, leakageInductanceH: L, capacitanceF: 2200e-6, esrOhm: 0.05,
      load: { kind: "resistive", resistanceOhm: 20 }, ambientC: 25,
    };
    let t = performance.now();
    const iso = solveBridgeAcAt(m, temps);
    const dt = performance.now() - t;
    if (!iso.ok) throw new Error(iso.reason);
    const ss = steadyStateOf(m, iso, temps, { thermalIterations: 0, periods: iso.periods });
    const b: SpiceBridge = { sourceRmsV: 24, frequencyHz: 50, sourceResistanceOhm: 0.5, leakageInductanceH: L, capacitanceF: 2200e-6, esrOhm: 0.05, loadOhm: 20, diode: dp, ...(sw ? { switchOnOhm: sw } : {}), tempC: 25, periods: 30, maxStepFraction: 1 / 2000 };
    t = performance.now();
    const s = reduceBridgeRows(runNgspice(bridgeNetlist(b)), b);
    const ds = performance.now() - t;
    console.log(dt.toFixed(1), ds.toFixed(0), iso.periods, iso.steps, ss.dcOutputV, s.dcOutputV, ss.elements.map((e) => e.rmsCurrentA.toFixed(5)).join(","), s.elementRmsA.map((v) => v.toFixed(5)).join(","), ss.elements.map((e) => e.lossW.toFixed(5)).join(","), s.elementLossW.map((v) => v.toFixed(5)).join(","), ss.energyBalance.relativeResidual, ss.rippleVpp, s.rippleVpp);
  }
});
