import type { DiodeParams } from "../physics/diode.js";
import { forwardCurrentAtA } from "../physics/diode.js";
import { channelConductance25S, channelResistanceOhm, fullEnhancementV } from "../physics/mosfet-channel.js";
import { channelWithBodyDiodeAtV, type ForwardState } from "./conduction.js";
import { gateDriveAt } from "./gate-drive.js";
import { mosfetAt } from "./mosfet-forward.js";
import { mosfetRatings, scaleMosfetStage } from "./mosfet-stage.js";
import { controllerDriven, controllerReverseStress } from "./controller-driven.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import type { BackToBackStage, DatasheetLeakage } from "./stage-model.js";
import { gateDischargeS } from "./turn-off-timing.js";

const OFF: ForwardState = {
  mode: "off",
  dropV: 0,
  lossW: 0,
  channelCurrentA: 0,
  bodyDiodeCurrentA: 0,
  bodyDiodeTimeFraction: 0,
};

/**
 * Two N-channel MOSFETs (the same part) in the supply line, sources joined (common source), both
 * gates driven by one controller from its charge pump. Forward current runs drain → source in the
 * input-side FET (its body diode reversed: this FET blocks a forward voltage) and source → drain
 * in the output-side FET (channel in parallel with its body diode; this FET blocks a reverse
 * voltage). So the pair conducts only while the gates are driven and blocks both ways when off:
 * below the controller's start voltage the load is unpowered ("off", not a body-diode path).
 *
 * On: drop = I·R(Vgs, Tj) + V₂, V₂ the channel-with-body-diode voltage of the output-side FET at I
 * (channelWithBodyDiodeAtV; ≈ I·R while the body diode carries nothing), so loss ≈ 2·I²·Rds(on)(Tj).
 * With a regulating (ideal-diode) controller the pair's drop is held at regulatedDropV while the
 * two channels would drop less. Thermal: the stage's path is the pair's (a dual package or both
 * FETs on one copper area), Tj = Ta + Rth·(P₁ + P₂); for two separately cooled FETs it heats one
 * die with both losses (conservative). channelResistanceOhm reports both channels, 2·R.
 *
 * Reverse: with an ideal-diode controller (blocksReverseCurrent) the comparator trips at the
 * threshold across both channels and both turn off; with a plain gate driver (a load switch) the
 * channels conduct backwards while driven. Off, the output-side FET's body diode blocks a reverse
 * voltage (rated by its VDS, leaking its IDSS), the input-side FET's blocks a forward one.
 */
export const nfetBackToBack: StageBehaviour<BackToBackStage> = {
  forward: (stage, currentA, tK, inputV, running) => {
    const c = stage.controller;
    if (!(running ?? inputV >= c.startV)) return OFF;
    const channel = stage.mosfet.channel;
    const vgs = gateDriveAt(c, inputV);
    const at = mosfetAt(channel, stage.mosfet.bodyDiode, tK);
    const g = channelConductance25S(channel, vgs, at.thresholdV);
    if (!(g > 0)) return OFF;
    const rOhm = at.rdsFactor / g;
    const mode = vgs >= fullEnhancementV(channel) ? "fully-enhanced" : "partially-enhanced";
    if (c.regulatedDropV > 0 && 2 * currentA * rOhm < c.regulatedDropV) {
      // The controller lowers the gates until the two channels drop regulatedDropV, half each.
      const bodyA = Math.min(currentA, Math.max(0, forwardCurrentAtA(at.bodyDiode, c.regulatedDropV / 2)));
      return {
        mode: "regulated-drop",
        dropV: c.regulatedDropV,
        lossW: c.regulatedDropV * currentA,
        channelCurrentA: currentA,
        bodyDiodeCurrentA: bodyA,
        gateSourceV: vgs,
        channelResistanceOhm: 2 * rOhm,
        bodyDiodeTimeFraction: 0,
      };
    }
    const outputSideV = channelWithBodyDiodeAtV(rOhm, at.bodyDiode, currentA);
    const dropV = currentA * rOhm + outputSideV;
    return {
      mode,
      dropV,
      lossW: dropV * currentA,
      channelCurrentA: currentA,
      bodyDiodeCurrentA: Math.max(0, currentA - outputSideV / rOhm),
      gateSourceV: vgs,
      channelResistanceOhm: 2 * rOhm,
      bodyDiodeTimeFraction: 0,
    };
  },
  ...mosfetRatings,
  ...controllerDriven,
  scale: scaleMosfetStage,
  // A positive peak: the controller's input pin, and the input-side FET, which blocks the whole
  // peak whenever the pair is off (below start or switched off).
  forwardLimits: (stage) => [
    ...(stage.controller.maxInputV === undefined
      ? []
      : [{ element: "controller-input" as const, ratingV: stage.controller.maxInputV, seenV: (v: number) => v }]),
    { element: "forward-blocking-fet", ratingV: stage.mosfet.vdsMaxV, seenV: (v) => v },
  ],
  blocksReverseCurrent: (stage) => stage.blocksReverseCurrent,
  needsTurnOffTiming: (stage) => stage.blocksReverseCurrent,
  junctionRecovery: false,
  reversePath: (stage, tK, inputBeforeV, _after, _outputV, timing) => {
    const r = pairOhm(stage, inputBeforeV, tK);
    if (!stage.blocksReverseCurrent) {
      if (r === undefined) return { kind: "diode", seriesOhm: 0 };
      return {
        kind: "channel-stays-on",
        channelOhm: r,
        thresholdV: 0,
        reason:
          "a back-to-back pair held on by a plain gate driver does not turn off on reverse current: it conducts backwards",
      };
    }
    if (timing === undefined)
      throw new Error("reversePath: a back-to-back pair with an ideal-diode controller needs its turn-off timing");
    // Off before the event, the output-side FET's body diode blocks at once (no stored charge to remove).
    if (r === undefined) return { kind: "diode", seriesOhm: 0 };
    return {
      kind: "controller",
      channelOhm: r,
      tripCurrentA: timing.reverseThresholdV / r,
      offDelayS: timing.turnOffDelayS + gateDischargeS(timing),
    };
  },
  reverseConduction: (stage, leftV, _rightV, tK) => {
    const r = stage.blocksReverseCurrent ? undefined : pairOhm(stage, leftV, tK);
    if (r !== undefined) return { kind: "channel", ohm: r };
    return { kind: "junction", diode: stage.mosfet.bodyDiode, leakage: stage.mosfet.offStateLeakage };
  },
  releasedGateDiode: () => undefined,
  reverseStress: (stage, reverseV) =>
    controllerReverseStress(
      stage,
      reverseV,
      "the gates are held off; the output-side FET's body diode blocks the reversed supply (the input-side FET's conducts) and the controller's input pin sees it",
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

/** Both channels in series at the gate drive the controller gives at inputV, ohm; undefined when the pair is off. */
function pairOhm(stage: BackToBackStage, inputV: number, tK: number): number | undefined {
  if (!(inputV >= stage.controller.startV)) return undefined;
  const r = channelResistanceOhm(stage.mosfet.channel, gateDriveAt(stage.controller, inputV), tK);
  return r === undefined ? undefined : 2 * r;
}

/** Which FET of an off pair blocks a voltage between its input and output, and against what. */
export interface OffStateBlocking {
  /** The input-side FET blocks a forward voltage; the output-side FET a reverse one. */
  readonly blockingFet: "input-side" | "output-side" | "none";
  /** Voltage across the blocking FET (magnitude, the other FET's body-diode drop neglected: conservative), V. */
  readonly blockedV: number;
  readonly ratingV: number;
  readonly withinRating: boolean;
  /** The blocking FET's body diode and its datasheet off-state leakage (IDSS), for its leakage. */
  readonly junction: DiodeParams;
  readonly leakage: DatasheetLeakage | undefined;
}

/** The pair with both gates off, inputV at its input and outputV at its output. */
export function offStateBlocking(stage: BackToBackStage, inputV: number, outputV: number): OffStateBlocking {
  const v = inputV - outputV;
  const ratingV = stage.mosfet.vdsMaxV;
  const blockingFet = v > 0 ? "input-side" : v < 0 ? "output-side" : "none";
  return {
    blockingFet,
    blockedV: Math.abs(v),
    ratingV,
    withinRating: Math.abs(v) <= ratingV,
    junction: stage.mosfet.bodyDiode,
    leakage: stage.mosfet.offStateLeakage,
  };
}
