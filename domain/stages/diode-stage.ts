import { junctionState } from "./conduction.js";
import { scaleDiode } from "./scale-parts.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import type { DiodeStage } from "./stage-model.js";

/**
 * A series PN or Schottky diode (the two kinds share one model; the fit of the forward law differs,
 * api/map/diode-params.ts). Forward: Shockley with series resistance (physics/diode.ts). Reverse:
 * the junction blocks and leaks (Is(T), or the datasheet's leakage); a turn-off removes its stored
 * charge. No control: no start voltage, no quiescent current.
 */
export const diodeStage: StageBehaviour<DiodeStage> = {
  forward: (stage, currentA, tK) => junctionState(stage.diode, currentA, tK, "junction"),
  tjMaxC: (stage) => stage.tjMaxC,
  startV: () => undefined,
  withStartV: (stage) => stage,
  driveAtInput: (_stage, inputV) => ({ inputV }),
  quiescentA: () => 0,
  quiescentHeatsDie: false,
  scale: (stage, s, thermal) =>
    Object.assign({}, stage, { diode: scaleDiode(stage.diode, s.forwardVoltageFactor), thermal }),
  forwardLimits: () => [],
  blocksReverseCurrent: () => true,
  needsTurnOffTiming: () => false,
  junctionRecovery: true,
  reversePath: (stage) => ({ kind: "diode", seriesOhm: stage.diode.seriesResistanceOhm }),
  reverseConduction: (stage) => ({ kind: "junction", diode: stage.diode, leakage: stage.reverseLeakage }),
  releasedGateDiode: () => undefined,
  reverseStress: (stage, reverseV) => ({
    stress: {
      blockingElement: "diode",
      partVoltageV: reverseV,
      ratingV: stage.reverseRatingV,
      note: "the series diode is reverse-biased and carries its leakage",
    },
    junction: stage.diode,
  }),
  blockingJunction: (stage) => stage.diode,
  reverseLeakage: (stage) => stage.reverseLeakage,
  breakdownV: (stage) => stage.reverseRatingV,
  reverseRatingV: (stage) => stage.reverseRatingV,
  avalancheEnergyJ: (stage) => stage.avalancheEnergyJ,
  peakRepetitiveCurrentA: (stage) => stage.peakRepetitiveCurrentA,
  ratedRdsOn: () => undefined,
  forwardDiode: (stage) => stage.diode,
  gateDriveMetric: false,
  gateSourceClampV: () => undefined,
  controllerReversePin: false,
  sizing: {
    forward: "forwardVoltage",
    reverseRating: "vrrmV",
    gateFromSupply: false,
    ratedGateDrive: false,
    control: false,
    leakage: true,
  },
  describe: (stage) => ({ metrics: {}, part: { vrrmV: stage.reverseRatingV }, missing: {} }),
};
