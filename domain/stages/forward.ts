import type { ForwardState } from "./conduction.js";
import { behaviourOf } from "./stage-behaviours.js";
import type { StageModel } from "./stage-model.js";

export { gateDriveAt } from "./gate-drive.js";

/**
 * Forward state of any stage carrying currentA ≥ 0 at junction temperature tK, with inputV the
 * voltage at the stage's input terminal (it sets the gate drive and whether a controller runs).
 * `running` fixes whether the control runs (a caller that has settled it for the whole circuit,
 * electrical-point.ts); absent, it runs from its start voltage up. Each kind's law is its own
 * module's (stage-behaviours.ts).
 */
export function stageForward(
  stage: StageModel,
  currentA: number,
  tK: number,
  inputV: number,
  running?: boolean,
): ForwardState {
  return behaviourOf(stage).forward(stage, currentA, tK, inputV, running);
}
