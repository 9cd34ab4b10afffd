import { diodeStage } from "./diode-stage.js";
import { integratedSwitch } from "./integrated-switch.js";
import { nfetBackToBack } from "./nfet-back-to-back.js";
import { nfetIdealDiode } from "./nfet-ideal-diode.js";
import { nfetLowSide } from "./nfet-low-side.js";
import { pfetHighSide } from "./pfet-high-side.js";
import type { StageBehaviour, StageOf } from "./stage-behaviour.js";
import type { StageKind, StageModel } from "./stage-model.js";

/** One behaviour per stage kind: the compiler refuses a kind without its record, or a record missing a member. */
export type StageBehaviours = { readonly [K in StageKind]: StageBehaviour<StageOf<K>> };

export const STAGE_BEHAVIOURS: StageBehaviours = {
  "pn-diode": diodeStage,
  "schottky-diode": diodeStage,
  "pfet-high-side": pfetHighSide,
  "nfet-low-side": nfetLowSide,
  "nfet-ideal-diode": nfetIdealDiode,
  "integrated-switch": integratedSwitch,
  "nfet-back-to-back": nfetBackToBack,
};

/** The behaviour of a stage's kind, typed for that stage. */
export function behaviourOf<S extends StageModel>(stage: S): StageBehaviour<S> {
  // The record's type pairs each kind with its own model; indexing by a union kind loses that pairing.
  return STAGE_BEHAVIOURS[stage.kind] as unknown as StageBehaviour<S>;
}

/**
 * The power a stage's control draws: its quiescent current times the voltage across it, the
 * stage's input terminal to ground (the supply less the source and wiring drop), W. The one
 * definition; the die loss (an integrated switch) or the controller's loss (a separate
 * controller) takes it according to quiescentHeatsDie.
 */
export function quiescentLossW(stage: StageModel, stageInputV: number): number {
  return behaviourOf(stage).quiescentA(stage) * Math.max(stageInputV, 0);
}

/** A separate controller's quiescent power (0 where the control heats the load die, or there is none), W. */
export function controllerLossW(stage: StageModel, stageInputV: number): number {
  return behaviourOf(stage).quiescentHeatsDie ? 0 : quiescentLossW(stage, stageInputV);
}
