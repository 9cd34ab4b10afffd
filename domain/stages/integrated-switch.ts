import type { ReversePath } from "../checks/reverse-path.js";
import { channelResistanceOhm, rdsTempFactor } from "../physics/mosfet-channel.js";
import { type ForwardState, junctionState } from "./conduction.js";
import { mosfetForward } from "./mosfet-forward.js";
import { scaleChannel, scaleDiode } from "./scale-parts.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import type { IntegratedSwitchStage } from "./stage-model.js";
import { gateDischargeS } from "./turn-off-timing.js";

/**
 * An integrated switch: MOSFET(s) and control on one die. From its start voltage (UVLO) the
 * internal gate drive holds the channel fully on (regulating the drop where it is an ideal-diode
 * type); below it the body diode conducts or the switch blocks. Its quiescent current heats the
 * same die. Reverse: an ideal-diode type turns off on reverse current, a plain switch conducts.
 * Its protections, where the part has them: above its overvoltage cut-off the switch is open (no
 * current, the load unpowered: the cut-off disconnects the output); at its current limit it holds the
 * current at the limit and its drop rises to what the load leaves, V_in − V_load(I_lim), its loss
 * that drop × I_lim (domain/solve/electrical-point.ts finds V_load).
 */
export const integratedSwitch: StageBehaviour<IntegratedSwitchStage> = {
  forward: (stage, currentA, tK, inputV, running) => {
    if (stage.overvoltageCutoffV !== undefined && inputV > stage.overvoltageCutoffV) return CUT_OFF;
    if (!(running ?? inputV >= stage.startV)) {
      if (stage.belowStart.mode === "blocks") {
        return { mode: "off", dropV: 0, lossW: 0, channelCurrentA: 0, bodyDiodeCurrentA: 0, bodyDiodeTimeFraction: 0 };
      }
      return junctionState(stage.belowStart.bodyDiode, currentA, tK, "body-diode");
    }
    const noBody = stage.belowStart.mode === "body-diode" ? stage.belowStart.bodyDiode : undefined;
    if (noBody) return mosfetForward(stage.channel, noBody, stage.internalGateV, currentA, tK, stage.regulatedDropV);
    return withoutBodyDiode(stage, currentA, tK);
  },
  currentLimitA: (stage) => stage.currentLimitA,
  atCurrentLimit: (stage, _tK, inputV, loadV) => {
    const limitA = stage.currentLimitA;
    if (limitA === undefined) throw new Error("atCurrentLimit: the switch has no current limit");
    const dropV = inputV - loadV;
    return {
      mode: "current-limit",
      dropV,
      lossW: dropV * limitA,
      channelCurrentA: limitA,
      bodyDiodeCurrentA: 0,
      gateSourceV: stage.internalGateV,
      // the limiting gate drive raises the channel's resistance to dropV / I_lim
      channelResistanceOhm: dropV / limitA,
      bodyDiodeTimeFraction: 0,
    };
  },
  cutoffV: (stage) => stage.overvoltageCutoffV,
  tjMaxC: (stage) => stage.tjMaxC,
  startV: (stage) => stage.startV,
  withStartV: (stage, startV) => ({ ...stage, startV }),
  driveAtInput: (stage, inputV) => ({ inputV, startMarginV: inputV - stage.startV }),
  quiescentA: (stage) => stage.quiescentA,
  quiescentHeatsDie: true,
  scale: (stage, s, thermal) =>
    Object.assign({}, stage, {
      channel: scaleChannel(stage.channel, s.rdsOnFactor),
      belowStart:
        stage.belowStart.mode === "body-diode"
          ? { mode: "body-diode" as const, bodyDiode: scaleDiode(stage.belowStart.bodyDiode, s.forwardVoltageFactor) }
          : stage.belowStart,
      thermal,
    }),
  forwardLimits: (stage) => [{ element: "switch-input", ratingV: stage.maxVoltageV, seenV: (v) => v }],
  blocksReverseCurrent: (stage) => stage.blocksReverseCurrent,
  needsTurnOffTiming: (stage) => stage.blocksReverseCurrent,
  junctionRecovery: false,
  reversePath: (stage, tK, inputBeforeV, _after, _outputV, timing) => {
    const r = inputBeforeV >= stage.startV ? channelResistanceOhm(stage.channel, stage.internalGateV, tK) : undefined;
    if (!stage.blocksReverseCurrent) {
      if (r === undefined) return offSwitch(stage);
      return {
        kind: "channel-stays-on",
        channelOhm: r,
        thresholdV: 0,
        reason: "a plain integrated switch does not turn off on reverse current: it conducts backwards",
      };
    }
    if (timing === undefined) throw new Error("reversePath: an integrated switch needs its turn-off timing");
    if (r === undefined) return offSwitch(stage);
    return {
      kind: "controller",
      channelOhm: r,
      tripCurrentA: timing.reverseThresholdV / r,
      offDelayS: timing.turnOffDelayS + gateDischargeS(timing),
    };
  },
  reverseConduction: (stage, _leftV, _rightV, tK) => {
    if (!stage.blocksReverseCurrent) {
      const r = channelResistanceOhm(stage.channel, stage.internalGateV, tK);
      if (r !== undefined) return { kind: "channel", ohm: r };
    }
    return stage.belowStart.mode === "body-diode"
      ? { kind: "junction", diode: stage.belowStart.bodyDiode }
      : { kind: "ideal-block" };
  },
  releasedGateDiode: (stage) => (stage.belowStart.mode === "body-diode" ? stage.belowStart.bodyDiode : undefined),
  reverseStress: (stage, reverseV) => ({
    stress: {
      blockingElement: "integrated-switch",
      partVoltageV: reverseV,
      ratingV: stage.reverseRatingV,
      note:
        stage.reverseRatingV === undefined
          ? "the switch states no reverse rating: its reverse blocking is unproven"
          : "the integrated switch blocks the reversed supply",
    },
    ...(stage.belowStart.mode === "body-diode" ? { junction: stage.belowStart.bodyDiode } : {}),
  }),
  blockingJunction: (stage) => (stage.belowStart.mode === "body-diode" ? stage.belowStart.bodyDiode : undefined),
  reverseLeakage: () => undefined,
  breakdownV: (stage) => stage.maxVoltageV,
  reverseRatingV: (stage) => stage.reverseRatingV,
  avalancheEnergyJ: (stage) => stage.avalancheEnergyJ,
  peakRepetitiveCurrentA: () => undefined,
  ratedRdsOn: (stage) => {
    const top = stage.channel.rdsOnPoints.at(-1);
    return top === undefined ? undefined : { rdsOnOhm: top.rdsOnOhm, gateSourceV: top.gateSourceV };
  },
  forwardDiode: () => undefined,
  gateDriveMetric: false,
  gateSourceClampV: () => undefined,
  controllerReversePin: false,
  sizing: {
    forward: "rdsOn",
    reverseRating: "none",
    gateFromSupply: false,
    ratedGateDrive: false,
    control: true,
    leakage: false,
  },
  describe: (stage) => ({
    metrics: { startVoltageV: stage.startV },
    part: {
      maxInputV: stage.maxVoltageV,
      ...(stage.reverseRatingV === undefined ? {} : { switchReverseRatingV: stage.reverseRatingV }),
    },
    missing:
      stage.reverseRatingV === undefined
        ? {
            "part.switchReverseRatingV":
              "the switch states no reverse rating (reverseRatingV): its reverse blocking is unproven",
          }
        : // typed, so the two branches stay one record type under a consumer's compiler settings too
          ({} as Record<string, string>),
  }),
};

/** Back-to-back integrated FETs: no body-diode path, the channel alone carries the current. */
function withoutBodyDiode(stage: IntegratedSwitchStage, currentA: number, tK: number): ForwardState {
  const point = stage.channel.rdsOnPoints[0];
  if (point === undefined) throw new Error("integrated switch without an on-resistance point");
  const rOhm = point.rdsOnOhm * rdsTempFactor(stage.channel.tempLaw, tK);
  const regulated = stage.regulatedDropV > 0 && currentA * rOhm < stage.regulatedDropV;
  const dropV = regulated ? stage.regulatedDropV : currentA * rOhm;
  return {
    mode: regulated ? "regulated-drop" : "fully-enhanced",
    dropV,
    lossW: dropV * currentA,
    channelCurrentA: currentA,
    bodyDiodeCurrentA: 0,
    gateSourceV: stage.internalGateV,
    channelResistanceOhm: rOhm,
    bodyDiodeTimeFraction: 0,
  };
}

const CUT_OFF = {
  mode: "cut-off",
  dropV: 0,
  lossW: 0,
  channelCurrentA: 0,
  bodyDiodeCurrentA: 0,
  bodyDiodeTimeFraction: 0,
} as const satisfies ForwardState;

function offSwitch(stage: IntegratedSwitchStage): ReversePath {
  return {
    kind: "diode",
    seriesOhm: stage.belowStart.mode === "body-diode" ? stage.belowStart.bodyDiode.seriesResistanceOhm : 0,
  };
}
