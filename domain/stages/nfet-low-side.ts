import { thresholdAtV } from "../physics/mosfet-channel.js";
import { clampV } from "./gate-drive.js";
import { mosfetForward } from "./mosfet-forward.js";
import { bodyDiodePath, onOhm } from "./mosfet-stage.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import { channelOrBodyDiode, supplyGated, supplyGateDrive } from "./supply-gated-fet.js";
import type { NFetLowSideStage } from "./stage-model.js";
import { gateDischargeS } from "./turn-off-timing.js";

/**
 * An N-channel MOSFET in the ground return, gate tied to the supply: Vgs = min(Vin, clamp).
 * Reverse: while its gate is held above threshold it conducts backwards; once the input falls
 * below threshold the gate discharges and the body diode blocks.
 */
export const nfetLowSide: StageBehaviour<NFetLowSideStage> = {
  forward: (stage, currentA, tK, inputV) =>
    mosfetForward(stage.mosfet.channel, stage.mosfet.bodyDiode, clampV(inputV, stage.gateClampV), currentA, tK, 0),
  ...supplyGated,
  driveAtInput: (stage, inputV) => supplyGateDrive(stage, inputV, inputV),
  reversePath: (stage, tK, inputBeforeV, inputAfterV, _outputV, timing) => {
    const r = onOhm(stage.mosfet, clampV(inputBeforeV, stage.gateClampV), tK);
    if (r === undefined) return bodyDiodePath(stage.mosfet);
    const vth = thresholdAtV(stage.mosfet.channel, tK);
    if (inputAfterV > vth) {
      return {
        kind: "channel-stays-on",
        channelOhm: r,
        thresholdV: vth,
        reason: "the low-side N-FET's gate is held by the remaining input, above threshold: it conducts backwards",
      };
    }
    return { kind: "gate-falls", channelOhm: r, offDelayS: gateDischargeS(timing) };
  },
  reverseConduction: (stage, leftV, _rightV, tK) =>
    channelOrBodyDiode(stage, onOhm(stage.mosfet, clampV(leftV, stage.gateClampV), tK)),
  reverseStress: (stage, reverseV) => ({
    stress: {
      blockingElement: "body-diode",
      partVoltageV: reverseV,
      ratingV: stage.mosfet.vdsMaxV,
      gateSourceV: 0,
      note: "the gate is pulled to the source side: the channel is off and the body diode in the return blocks",
    },
    junction: stage.mosfet.bodyDiode,
  }),
};
