import { scaleThermal } from "./scale-parts.js";
import { behaviourOf } from "./stage-behaviours.js";
import type { StageModel } from "./stage-model.js";

export { scaleDiode, scaleThermal } from "./scale-parts.js";

/** Multiplicative tolerances applied to a stage: datasheet maximum against typical, or a sample. */
export interface StageScale {
  /** Rds(on) (and an integrated switch's on-resistance) × this. */
  readonly rdsOnFactor: number;
  /** Forward voltage at 25 °C × this (ideality and series resistance scaled; the temperature shift kept). */
  readonly forwardVoltageFactor: number;
  /** Every thermal resistance of the path × this. */
  readonly rthFactor: number;
  /** Added to a controller's or integrated switch's start voltage, V (datasheet maximum − typical, or a sample); absent: 0. */
  readonly startShiftV?: number;
  /** Added to a MOSFET's gate threshold Vth, V (datasheet maximum − typical, or a sample); absent: 0. */
  readonly thresholdShiftV?: number;
}

export const UNSCALED: StageScale = { rdsOnFactor: 1, forwardVoltageFactor: 1, rthFactor: 1 };

/**
 * Scale a stage. A diode's forward voltage n·Vt·ln(I/Is + 1) + I·Rs scales exactly by k at the
 * nominal temperature when n and Rs scale by k with Is held; the Is(T) shift with temperature is
 * kept, so the part keeps its temperature coefficient. What each kind scales is its own module's.
 */
export function scaleStage(stage: StageModel, s: StageScale): StageModel {
  const startShiftV = s.startShiftV ?? 0;
  const thresholdShiftV = s.thresholdShiftV ?? 0;
  if (
    s.rdsOnFactor === 1 &&
    s.forwardVoltageFactor === 1 &&
    s.rthFactor === 1 &&
    startShiftV === 0 &&
    thresholdShiftV === 0
  )
    return stage;
  const behaviour = behaviourOf(stage);
  const scaled = behaviour.scale(stage, s, scaleThermal(stage.thermal, s.rthFactor));
  const startV = behaviour.startV(scaled);
  // a controller's or integrated switch's start voltage shifted (a stage without control has none)
  return startShiftV === 0 || startV === undefined
    ? scaled
    : behaviour.withStartV(scaled, Math.max(0, startV + startShiftV));
}
