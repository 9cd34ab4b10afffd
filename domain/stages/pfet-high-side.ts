import { channelConductance25S, fullEnhancementV } from "../physics/mosfet-channel.js";
import { clampV } from "./gate-drive.js";
import { onOhm } from "./mosfet-stage.js";
import { mosfetAt, mosfetForwardAt, withGateSourceV } from "./mosfet-forward.js";
import type { StageBehaviour } from "./stage-behaviour.js";
import { channelOrBodyDiode, gateFromOutputPath, supplyGated, supplyGateDrive } from "./supply-gated-fet.js";
import type { PFetStage } from "./stage-model.js";

/**
 * A P-channel MOSFET in the supply line, gate to ground: |Vgs| = min(Vin − drop, clamp). Reverse:
 * its gate stays at ground, so with the output up the channel stays on and conducts backwards;
 * a reversed supply is blocked by the body diode (channel off).
 */
export const pfetHighSide: StageBehaviour<PFetStage> = {
  forward: (stage, currentA, tK, inputV) => {
    // The source sits at the output: |Vgs| = Vin − drop(Vgs) =: F(Vgs), a strong contraction (the
    // drop is small against Vin). Substitution, accelerated by the secant on g = F(v) − v through
    // the last two trials (superlinear); a secant point farther from F(v) than the step |g| (a
    // kink of the clamp or of the Rds(on) curve) is dropped for plain substitution. The
    // temperature laws are formed once (the junction stays at tK).
    const channel = stage.mosfet.channel;
    const at = mosfetAt(channel, stage.mosfet.bodyDiode, tK);
    const fullOn = fullEnhancementV(channel);
    let vgs = clampV(inputV, stage.gateClampV);
    let state = mosfetForwardAt(channel, at, vgs, currentA, 0);
    let prevV = Number.NaN;
    let prevG = Number.NaN;
    for (let i = 0; i < 30; i += 1) {
      const next = clampV(Math.max(0, inputV - state.dropV), stage.gateClampV);
      const g = next - vgs;
      if (Math.abs(g) < 1e-12) break;
      let trial = next;
      if (g !== prevG && Number.isFinite(prevG)) {
        const secant = clampV(Math.max(0, vgs - (g * (vgs - prevV)) / (g - prevG)), stage.gateClampV);
        if (Math.abs(secant - next) <= Math.abs(g)) trial = secant;
      }
      prevV = vgs;
      prevG = g;
      // Where the 25 °C conductance and the enhancement class do not change (above the highest
      // Rds(on) point, or below threshold) the state is the same but for Vgs: no new solve.
      const same =
        channelConductance25S(channel, trial, at.thresholdV) === channelConductance25S(channel, vgs, at.thresholdV) &&
        trial >= fullOn === vgs >= fullOn;
      vgs = trial;
      state = same ? withGateSourceV(state, vgs) : mosfetForwardAt(channel, at, vgs, currentA, 0);
    }
    return state;
  },
  ...supplyGated,
  driveAtInput: (stage, inputV, dropV) => supplyGateDrive(stage, inputV, inputV - dropV),
  reversePath: (stage, tK, _before, _after, outputV) =>
    gateFromOutputPath(
      stage,
      tK,
      outputV,
      "a P-FET with its gate at ground keeps |Vgs| = V(output): it conducts backwards until the output falls below its threshold",
    ),
  reverseConduction: (stage, _leftV, rightV, tK) =>
    channelOrBodyDiode(stage, onOhm(stage.mosfet, clampV(rightV, stage.gateClampV), tK)),
  reverseStress: (stage, reverseV) => ({
    stress: {
      blockingElement: "body-diode",
      partVoltageV: reverseV,
      ratingV: stage.mosfet.vdsMaxV,
      gateSourceV: 0,
      note: "the gate and source both sit near 0 V (gate to ground, output discharged): the channel is off and the body diode blocks",
    },
    junction: stage.mosfet.bodyDiode,
  }),
};
