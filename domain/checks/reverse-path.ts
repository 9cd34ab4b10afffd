import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";
import type { ControllerTurnOff } from "../stages/turn-off-timing.js";

export { type ControllerTurnOff, gateDischargeS } from "../stages/turn-off-timing.js";

/**
 * How a stage behaves when the current through it reverses:
 * - "controller": the channel conducts backwards until the reverse drop i·Rds reaches the
 *   comparator threshold, then turns off after the delay (plus gate discharge);
 * - "diode": conducts in reverse only while its stored (reverse-recovery) charge is removed;
 * - "channel-stays-on": a FET whose gate is fed from the supply (a P-FET with its gate at ground,
 *   a low-side N-FET with its gate fed from the positive rail) keeps |Vgs| = V(output) and
 *   conducts backwards (it does not block) until that, lagged, falls below threshold;
 * A MOSFET whose channel is already off before the event conducts through its body diode and
 * is treated as a diode. The channel resistance is taken at the pre-event gate drive and
 * junction temperature.
 */
export type ReversePath =
  | {
      readonly kind: "controller";
      readonly channelOhm: number;
      readonly tripCurrentA: number;
      readonly offDelayS: number;
    }
  | { readonly kind: "diode"; readonly seriesOhm: number }
  | {
      readonly kind: "channel-stays-on";
      readonly channelOhm: number;
      readonly thresholdV: number;
      readonly reason: string;
      /**
       * A FET whose gate is fed from the supply (supply-gated-fet.ts gateFromOutputPath): its |Vgs|
       * is the output (up to its gate clamp), lagged by the gate's R·C, so the channel turns off
       * once that falls below threshold.
       */
      readonly gateFromOutput?: { readonly clampV?: number | undefined };
    };

/** inputBeforeV: input before the event (gate drive); inputAfterV: the input after it. */
export function reversePath(
  stage: StageModel,
  tK: number,
  inputBeforeV: number,
  inputAfterV: number,
  outputV: number,
  timing: ControllerTurnOff | undefined,
): ReversePath {
  return behaviourOf(stage).reversePath(stage, tK, inputBeforeV, inputAfterV, outputV, timing);
}

/** The voltage at which the blocking element breaks down: the clamp for the inductive energy. */
export function stageBreakdownV(stage: StageModel): number {
  return behaviourOf(stage).breakdownV(stage);
}
