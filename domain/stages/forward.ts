import { channelConductance25S, fullEnhancementV, rdsTempFactor } from "../physics/mosfet-channel.js";
import { type ForwardState, junctionState, junctionStateAt } from "./conduction.js";
import { blendWithBodyDiode, mosfetAt, mosfetForward, mosfetForwardAt, withGateSourceV } from "./mosfet-forward.js";
import type { StageModel } from "./stage-model.js";

/**
 * Forward state of any stage carrying currentA ≥ 0 at junction temperature tK, with inputV the
 * voltage at the stage's input terminal (it sets the gate drive and whether a controller runs).
 * `running` fixes whether the control runs (a caller that has settled it for the whole circuit,
 * electrical-point.ts); absent, it runs from its start voltage up.
 */
export function stageForward(stage: StageModel, currentA: number, tK: number, inputV: number, running?: boolean): ForwardState {
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return junctionState(stage.diode, currentA, tK, "junction");
    case "nfet-low-side": {
      const vgs = clamp(inputV, stage.gateClampV);
      return mosfetForward(stage.mosfet.channel, stage.mosfet.bodyDiode, vgs, currentA, tK, 0);
    }
    case "pfet-high-side": {
      // The source sits at the output: |Vgs| = Vin − drop(Vgs) =: F(Vgs), a strong contraction (the
      // drop is small against Vin). Substitution, accelerated by the secant on g = F(v) − v through
      // the last two trials (superlinear); a secant point farther from F(v) than the step |g| (a
      // kink of the clamp or of the Rds(on) curve) is dropped for plain substitution. The
      // temperature laws are formed once (the junction stays at tK).
      const channel = stage.mosfet.channel;
      const at = mosfetAt(channel, stage.mosfet.bodyDiode, tK);
      const fullOn = fullEnhancementV(channel);
      let vgs = clamp(inputV, stage.gateClampV);
      let state = mosfetForwardAt(channel, at, vgs, currentA, 0);
      let prevV = Number.NaN;
      let prevG = Number.NaN;
      for (let i = 0; i < 30; i += 1) {
        const next = clamp(Math.max(0, inputV - state.dropV), stage.gateClampV);
        const g = next - vgs;
        if (Math.abs(g) < 1e-12) break;
        let trial = next;
        if (g !== prevG && Number.isFinite(prevG)) {
          const secant = clamp(Math.max(0, vgs - (g * (vgs - prevV)) / (g - prevG)), stage.gateClampV);
          if (Math.abs(secant - next) <= Math.abs(g)) trial = secant;
        }
        prevV = vgs;
        prevG = g;
        // Where the 25 °C conductance and the enhancement class do not change (above the highest
        // Rds(on) point, or below threshold) the state is the same but for Vgs: no new solve.
        const same = channelConductance25S(channel, trial) === channelConductance25S(channel, vgs) && trial >= fullOn === vgs >= fullOn;
        vgs = trial;
        state = same ? withGateSourceV(state, vgs) : mosfetForwardAt(channel, at, vgs, currentA, 0);
      }
      return state;
    }
    case "nfet-ideal-diode": {
      const c = stage.controller;
      if (!(running ?? inputV >= c.startV)) return junctionState(stage.mosfet.bodyDiode, currentA, tK, "body-diode");
      const at = mosfetAt(stage.mosfet.channel, stage.mosfet.bodyDiode, tK);
      const on = mosfetForwardAt(stage.mosfet.channel, at, gateDriveAt(c, inputV), currentA, c.regulatedDropV);
      if (c.gateReleaseFraction <= 0) return on;
      return blendWithBodyDiode(on, junctionStateAt(at.bodyDiode, currentA, "body-diode"), c.gateReleaseFraction);
    }
    case "integrated-switch": {
      if (!(running ?? inputV >= stage.startV)) {
        if (stage.belowStart.mode === "blocks") {
          return { mode: "off", dropV: 0, lossW: 0, channelCurrentA: 0, bodyDiodeCurrentA: 0, bodyDiodeTimeFraction: 0 };
        }
        return junctionState(stage.belowStart.bodyDiode, currentA, tK, "body-diode");
      }
      const noBody = stage.belowStart.mode === "body-diode" ? stage.belowStart.bodyDiode : undefined;
      if (noBody) return mosfetForward(stage.channel, noBody, stage.internalGateV, currentA, tK, stage.regulatedDropV);
      return integratedWithoutBodyDiode(stage, currentA, tK);
    }
  }
}

function integratedWithoutBodyDiode(
  stage: Extract<StageModel, { kind: "integrated-switch" }>,
  currentA: number,
  tK: number,
): ForwardState {
  // Back-to-back integrated FETs: no body-diode path, the channel alone carries the current.
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

/** Charge-pump gate drive at an input voltage: linear between the points, flat outside (no allocation). */
export function gateDriveAt(c: { readonly gateDrive: readonly { readonly inputV: number; readonly gateSourceV: number }[] }, inputV: number): number {
  const pts = c.gateDrive;
  const first = pts[0];
  if (first === undefined) return 0;
  if (inputV <= first.inputV) return first.gateSourceV;
  for (let i = 1; i < pts.length; i += 1) {
    const a = pts[i - 1];
    const b = pts[i];
    if (a && b && inputV <= b.inputV) return a.gateSourceV + ((b.gateSourceV - a.gateSourceV) * (inputV - a.inputV)) / (b.inputV - a.inputV);
  }
  return pts[pts.length - 1]?.gateSourceV ?? 0;
}

function clamp(v: number, limit: number | undefined): number {
  return limit === undefined ? v : Math.min(v, limit);
}
