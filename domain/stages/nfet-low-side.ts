import { fullEnhancementV } from "../physics/mosfet-channel.js";
import { clampV } from "./gate-drive.js";
import { mosfetForward } from "./mosfet-forward.js";
import { bodyDiodePath, mosfetPart, mosfetRatings, NO_AVALANCHE_CURRENT, onOhm, scaleMosfetStage } from "./mosfet-stage.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import type { NFetLowSideStage } from "./stage-model.js";
import { gateDischargeS } from "./turn-off-timing.js";

/**
 * An N-channel MOSFET in the ground return, gate tied to the supply: Vgs = min(Vin, clamp).
 * Reverse: while its gate is held above threshold it conducts backwards; once the input falls
 * below threshold the gate discharges and the body diode blocks.
 */
export const nfetLowSide: StageBehaviour<NFetLowSideStage> = {
  forward: (stage, currentA, tK, inputV) => mosfetForward(stage.mosfet.channel, stage.mosfet.bodyDiode, clampV(inputV, stage.gateClampV), currentA, tK, 0),
  ...mosfetRatings,
  startV: () => undefined,
  withStartV: (stage) => stage,
  driveAtInput: (stage, inputV) => {
    const vgs = clampV(inputV, stage.gateClampV);
    return { inputV, gateSourceV: vgs, gateDriveMarginV: vgs - fullEnhancementV(stage.mosfet.channel) };
  },
  quiescentA: () => 0,
  quiescentHeatsDie: false,
  scale: scaleMosfetStage,
  forwardLimits: (stage) => [{ element: "gate-source", ratingV: stage.mosfet.vgsMaxV, seenV: (v) => clampV(v, stage.gateClampV) }],
  blocksReverseCurrent: () => false,
  needsTurnOffTiming: () => false,
  junctionRecovery: false,
  reversePath: (stage, tK, inputBeforeV, inputAfterV, _outputV, timing) => {
    const r = onOhm(stage.mosfet, clampV(inputBeforeV, stage.gateClampV), tK);
    if (r === undefined) return bodyDiodePath(stage.mosfet);
    if (inputAfterV > stage.mosfet.channel.thresholdV) {
      return {
        kind: "channel-stays-on",
        channelOhm: r,
        thresholdV: stage.mosfet.channel.thresholdV,
        reason: "the low-side N-FET's gate is held by the remaining input, above threshold: it conducts backwards",
      };
    }
    return { kind: "gate-falls", channelOhm: r, offDelayS: gateDischargeS(timing) };
  },
  reverseConduction: (stage, leftV, _rightV, tK) => {
    const r = onOhm(stage.mosfet, clampV(leftV, stage.gateClampV), tK);
    if (r === undefined) return { kind: "junction", diode: stage.mosfet.bodyDiode, leakage: stage.mosfet.offStateLeakage };
    return { kind: "channel", ohm: r, bodyDiode: stage.mosfet.bodyDiode };
  },
  releasedGateDiode: () => undefined,
  reverseStress: (stage, reverseV) => ({
    stress: { blockingElement: "body-diode", partVoltageV: reverseV, ratingV: stage.mosfet.vdsMaxV, gateSourceV: 0, note: "the gate is pulled to the source side: the channel is off and the body diode in the return blocks" },
    junction: stage.mosfet.bodyDiode,
  }),
  gateDriveMetric: true,
  gateSourceClampV: (stage) => ({ clampV: stage.gateClampV }),
  controllerReversePin: false,
  sizing: { forward: "rdsOn", reverseRating: "vdsMaxV", gateFromSupply: true, ratedGateDrive: true, control: false, leakage: false },
  describe: (stage) => ({ metrics: {}, part: mosfetPart(stage.mosfet), missing: stage.mosfet.avalancheCurrentA === undefined ? { "part.avalancheCurrentA": NO_AVALANCHE_CURRENT } : {} }),
};
