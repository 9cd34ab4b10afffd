import { fullEnhancementV, interpolate } from "../physics/mosfet-channel.js";
import { junctionState, junctionStateAt } from "./conduction.js";
import { gateDriveAt } from "./gate-drive.js";
import { blendWithBodyDiode, mosfetAt, mosfetForwardAt } from "./mosfet-forward.js";
import { bodyDiodePath, mosfetPart, mosfetRatings, NO_AVALANCHE_CURRENT, onOhm, scaleMosfetStage } from "./mosfet-stage.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import type { IdealDiodeStage } from "./stage-model.js";
import { gateDischargeS } from "./turn-off-timing.js";

/**
 * An N-channel MOSFET in the supply line driven by an ideal-diode controller: from its start
 * voltage the controller drives the gate from its charge pump (regulating the drop at light
 * load); below it the body diode carries the load. Reverse current trips the comparator and the
 * channel turns off after the delay; a reversed supply is blocked by the body diode while the
 * controller's input pin sees it. The controller's quiescent current is its own (not the die's).
 */
export const nfetIdealDiode: StageBehaviour<IdealDiodeStage> = {
  forward: (stage, currentA, tK, inputV, running) => {
    const c = stage.controller;
    if (!(running ?? inputV >= c.startV)) return junctionState(stage.mosfet.bodyDiode, currentA, tK, "body-diode");
    const at = mosfetAt(stage.mosfet.channel, stage.mosfet.bodyDiode, tK);
    const on = mosfetForwardAt(stage.mosfet.channel, at, gateDriveAt(c, inputV), currentA, c.regulatedDropV);
    if (c.gateReleaseFraction <= 0) return on;
    return blendWithBodyDiode(on, junctionStateAt(at.bodyDiode, currentA, "body-diode"), c.gateReleaseFraction);
  },
  ...mosfetRatings,
  startV: (stage) => stage.controller.startV,
  withStartV: (stage, startV) => ({ ...stage, controller: { ...stage.controller, startV } }),
  driveAtInput: (stage, inputV) => {
    const c = stage.controller;
    const vgs = inputV >= c.startV ? gateDriveAt(c, inputV) : 0;
    return { inputV, startMarginV: inputV - c.startV, gateSourceV: vgs, gateDriveMarginV: vgs - fullEnhancementV(stage.mosfet.channel) };
  },
  quiescentA: (stage) => stage.controller.quiescentA,
  quiescentHeatsDie: false,
  scale: scaleMosfetStage,
  forwardLimits: (stage) => (stage.controller.maxInputV === undefined ? [] : [{ element: "controller-input", ratingV: stage.controller.maxInputV, seenV: (v) => v }]),
  blocksReverseCurrent: () => true,
  needsTurnOffTiming: () => true,
  junctionRecovery: false,
  reversePath: (stage, tK, inputBeforeV, _after, _outputV, timing) => {
    if (timing === undefined) throw new Error("reversePath: a controller stage needs its turn-off timing");
    const c = stage.controller;
    const vgs = interpolate(c.gateDrive.map((p) => [p.inputV, p.gateSourceV] as const), inputBeforeV);
    const r = inputBeforeV >= c.startV ? onOhm(stage.mosfet, vgs, tK) : undefined;
    if (r === undefined) return bodyDiodePath(stage.mosfet);
    return { kind: "controller", channelOhm: r, tripCurrentA: timing.reverseThresholdV / r, offDelayS: timing.turnOffDelayS + gateDischargeS(timing) };
  },
  // In steady reverse the controller holds the gate off: the body diode leaks.
  reverseConduction: (stage) => ({ kind: "junction", diode: stage.mosfet.bodyDiode, leakage: stage.mosfet.offStateLeakage }),
  releasedGateDiode: (stage) => stage.mosfet.bodyDiode,
  reverseStress: (stage, reverseV) => ({
    stress: {
      blockingElement: "body-diode",
      partVoltageV: reverseV,
      ratingV: stage.mosfet.vdsMaxV,
      controllerReverseV: reverseV,
      ...(stage.controller.reverseRatingV === undefined ? {} : { controllerRatingV: stage.controller.reverseRatingV }),
      gateSourceV: 0,
      note: "the controller holds the gate off; the body diode blocks and the controller's input pin sees the reversed supply",
    },
    junction: stage.mosfet.bodyDiode,
  }),
  gateDriveMetric: true,
  gateSourceClampV: () => undefined,
  controllerReversePin: true,
  sizing: { forward: "rdsOn", reverseRating: "vdsMaxV", gateFromSupply: false, ratedGateDrive: true, control: true, leakage: false },
  describe: (stage) => ({ metrics: { startVoltageV: stage.controller.startV }, part: controllerPart(stage), missing: controllerMissing(stage) }),
};

/** The MOSFET's ratings and the controller's input ratings (a controller driving one or two FETs). */
export function controllerPart(stage: Pick<IdealDiodeStage, "mosfet" | "controller">): Record<string, number> {
  const part = mosfetPart(stage.mosfet);
  if (stage.controller.maxInputV !== undefined) part["maxInputV"] = stage.controller.maxInputV;
  if (stage.controller.reverseRatingV !== undefined) part["controllerReverseRatingV"] = stage.controller.reverseRatingV;
  return part;
}

export function controllerMissing(stage: Pick<IdealDiodeStage, "mosfet" | "controller">): Record<string, string> {
  const out: Record<string, string> = {};
  if (stage.controller.reverseRatingV === undefined) out["part.controllerReverseRatingV"] = "the controller states no reverse rating of its input pin (controller.reverseRatingV): its survival of the reversed supply is unproven";
  if (stage.mosfet.avalancheCurrentA === undefined) out["part.avalancheCurrentA"] = NO_AVALANCHE_CURRENT;
  return out;
}
