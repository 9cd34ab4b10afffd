import { interpolate } from "../physics/mosfet-channel.js";
import { junctionState, junctionStateAt } from "./conduction.js";
import { gateDriveAt } from "./gate-drive.js";
import { blendWithBodyDiode, mosfetAt, mosfetForwardAt } from "./mosfet-forward.js";
import { bodyDiodePath, mosfetRatings, onOhm, scaleMosfetStage } from "./mosfet-stage.js";
import { controllerDriven, controllerReverseStress } from "./controller-driven.js";
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
  ...controllerDriven,
  scale: scaleMosfetStage,
  forwardLimits: (stage) =>
    stage.controller.maxInputV === undefined
      ? []
      : [{ element: "controller-input", ratingV: stage.controller.maxInputV, seenV: (v) => v }],
  blocksReverseCurrent: () => true,
  needsTurnOffTiming: () => true,
  junctionRecovery: false,
  reversePath: (stage, tK, inputBeforeV, _after, _outputV, timing) => {
    if (timing === undefined) throw new Error("reversePath: a controller stage needs its turn-off timing");
    const c = stage.controller;
    const vgs = interpolate(
      c.gateDrive.map((p) => [p.inputV, p.gateSourceV] as const),
      inputBeforeV,
    );
    const r = inputBeforeV >= c.startV ? onOhm(stage.mosfet, vgs, tK) : undefined;
    if (r === undefined) return bodyDiodePath(stage.mosfet);
    return {
      kind: "controller",
      channelOhm: r,
      tripCurrentA: timing.reverseThresholdV / r,
      offDelayS: timing.turnOffDelayS + gateDischargeS(timing),
    };
  },
  // In steady reverse the controller holds the gate off: the body diode leaks.
  reverseConduction: (stage) => ({
    kind: "junction",
    diode: stage.mosfet.bodyDiode,
    leakage: stage.mosfet.offStateLeakage,
  }),
  releasedGateDiode: (stage) => stage.mosfet.bodyDiode,
  reverseStress: (stage, reverseV) =>
    controllerReverseStress(
      stage,
      reverseV,
      "the controller holds the gate off; the body diode blocks and the controller's input pin sees the reversed supply",
    ),
  sizing: {
    forward: "rdsOn",
    reverseRating: "vdsMaxV",
    gateFromSupply: false,
    ratedGateDrive: true,
    control: true,
    leakage: false,
  },
};
