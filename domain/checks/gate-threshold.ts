import { ZERO_C_IN_K } from "../physics/constants.js";
import { thresholdAtV } from "../physics/mosfet-channel.js";
import { scaleStage, UNSCALED } from "../stages/scale-stage.js";
import type { StageModel } from "../stages/stage-model.js";
import { stageMosfet } from "./breakdown-temperature.js";

/**
 * The stage with its MOSFET's gate threshold moved by shiftV (a datasheet corner or a sample,
 * floored at 0 V by the stage's own scaling); the stage itself at 0.
 */
export function withThresholdShift(stage: StageModel, shiftV: number): StageModel {
  return shiftV === 0 ? stage : scaleStage(stage, { ...UNSCALED, thresholdShiftV: shiftV });
}

/**
 * The MOSFET's gate threshold at the coldest ambient, V: its 25 °C value moved by its temperature
 * coefficient to the die at ambient (a cold start), where Vth is highest for a negative
 * coefficient; undefined for a stage without a discrete MOSFET. The review's gateOverdriveColdV,
 * the sizing's and the Monte Carlo's are the drive less this.
 */
export function gateThresholdColdV(stage: StageModel, ambientMinC: number): number | undefined {
  const fet = stageMosfet(stage);
  return fet === undefined ? undefined : thresholdAtV(fet.channel, ambientMinC + ZERO_C_IN_K);
}
