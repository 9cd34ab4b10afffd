import { type ChannelParams, channelResistanceOhm, interpolate } from "../physics/mosfet-channel.js";
import type { StageModel } from "../stages/stage-model.js";

/** Timing of a controller's reverse-current turn-off (ideal-diode controller, integrated switch). */
export interface ControllerTurnOff {
  /** Reverse drain-source voltage at which the comparator trips (magnitude), V. */
  readonly reverseThresholdV: number;
  /** Comparator and driver delay from the trip to the start of the gate discharge, s. */
  readonly turnOffDelayS: number;
  /** Gate charge to remove, C, and the driver's sink current, A: adds Qg/Isink when both given. */
  readonly gateChargeC?: number;
  readonly gateSinkCurrentA?: number;
}

/**
 * How a stage behaves when the current through it reverses:
 * - "controller": the channel conducts backwards until the reverse drop i·Rds reaches the
 *   comparator threshold, then turns off after the delay (plus gate discharge);
 * - "diode": conducts in reverse only while its stored (reverse-recovery) charge is removed;
 * - "channel-stays-on": a P-FET with its gate at ground keeps |Vgs| = V(output) and conducts
 *   backwards (it does not block); a low-side N-FET whose gate is held by a remaining input
 *   above threshold does the same;
 * - "gate-falls": a low-side N-FET whose input (its gate drive) fell below threshold turns off
 *   after the gate discharge; its body diode then blocks.
 * A MOSFET whose channel is already off before the event conducts through its body diode and
 * is treated as a diode. The channel resistance is taken at the pre-event gate drive and
 * junction temperature.
 */
export type ReversePath =
  | { readonly kind: "controller"; readonly channelOhm: number; readonly tripCurrentA: number; readonly offDelayS: number }
  | { readonly kind: "diode"; readonly seriesOhm: number }
  | { readonly kind: "channel-stays-on"; readonly channelOhm: number; readonly thresholdV: number; readonly reason: string }
  | { readonly kind: "gate-falls"; readonly channelOhm: number; readonly offDelayS: number };

export function gateDischargeS(c: ControllerTurnOff | undefined): number {
  if (c?.gateChargeC === undefined || c.gateSinkCurrentA === undefined || !(c.gateSinkCurrentA > 0)) return 0;
  return c.gateChargeC / c.gateSinkCurrentA;
}

/** inputBeforeV: input before the event (gate drive); inputAfterV: the input after it. */
export function reversePath(
  stage: StageModel,
  tK: number,
  inputBeforeV: number,
  inputAfterV: number,
  outputV: number,
  timing: ControllerTurnOff | undefined,
): ReversePath {
  const onOhm = (ch: ChannelParams, vgs: number): number | undefined => channelResistanceOhm(ch, vgs, tK);
  const clamp = (v: number, lim: number | undefined): number => (lim === undefined ? v : Math.min(v, lim));
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return { kind: "diode", seriesOhm: stage.diode.seriesResistanceOhm };
    case "pfet-high-side": {
      const r = onOhm(stage.mosfet.channel, clamp(outputV, stage.gateClampV));
      if (r === undefined) return { kind: "diode", seriesOhm: stage.mosfet.bodyDiode.seriesResistanceOhm };
      return {
        kind: "channel-stays-on",
        channelOhm: r,
        thresholdV: stage.mosfet.channel.thresholdV,
        reason: "a P-FET with its gate at ground keeps |Vgs| = V(output): it conducts backwards until the output falls below its threshold",
      };
    }
    case "nfet-low-side": {
      const r = onOhm(stage.mosfet.channel, clamp(inputBeforeV, stage.gateClampV));
      if (r === undefined) return { kind: "diode", seriesOhm: stage.mosfet.bodyDiode.seriesResistanceOhm };
      if (inputAfterV > stage.mosfet.channel.thresholdV) {
        return {
          kind: "channel-stays-on",
          channelOhm: r,
          thresholdV: stage.mosfet.channel.thresholdV,
          reason: "the low-side N-FET's gate is held by the remaining input, above threshold: it conducts backwards",
        };
      }
      return { kind: "gate-falls", channelOhm: r, offDelayS: gateDischargeS(timing) };
    }
    case "nfet-ideal-diode": {
      if (timing === undefined) throw new Error("reversePath: a controller stage needs its turn-off timing");
      const c = stage.controller;
      const vgs = interpolate(c.gateDrive.map((p) => [p.inputV, p.gateSourceV] as const), inputBeforeV);
      const r = inputBeforeV >= c.startV ? onOhm(stage.mosfet.channel, vgs) : undefined;
      if (r === undefined) return { kind: "diode", seriesOhm: stage.mosfet.bodyDiode.seriesResistanceOhm };
      return { kind: "controller", channelOhm: r, tripCurrentA: timing.reverseThresholdV / r, offDelayS: timing.turnOffDelayS + gateDischargeS(timing) };
    }
    case "integrated-switch": {
      if (!stage.blocksReverseCurrent) {
        const r = inputBeforeV >= stage.startV ? onOhm(stage.channel, stage.internalGateV) : undefined;
        if (r === undefined) return offSwitch(stage);
        return { kind: "channel-stays-on", channelOhm: r, thresholdV: 0, reason: "a plain integrated switch does not turn off on reverse current: it conducts backwards" };
      }
      if (timing === undefined) throw new Error("reversePath: an integrated switch needs its turn-off timing");
      const r = inputBeforeV >= stage.startV ? onOhm(stage.channel, stage.internalGateV) : undefined;
      if (r === undefined) return offSwitch(stage);
      return { kind: "controller", channelOhm: r, tripCurrentA: timing.reverseThresholdV / r, offDelayS: timing.turnOffDelayS + gateDischargeS(timing) };
    }
  }
}

function offSwitch(stage: Extract<StageModel, { kind: "integrated-switch" }>): ReversePath {
  return { kind: "diode", seriesOhm: stage.belowStart.mode === "body-diode" ? stage.belowStart.bodyDiode.seriesResistanceOhm : 0 };
}

/** The voltage at which the blocking element breaks down: the clamp for the inductive energy. */
export function stageBreakdownV(stage: StageModel): number {
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return stage.reverseRatingV;
    case "integrated-switch":
      return stage.maxVoltageV;
    default:
      return stage.mosfet.vdsMaxV;
  }
}
