import type { CandidateReview, ReviewRequirement } from "../review/candidate-review.js";
import type { CompiledRuleSet } from "../rules/compile-rule-set.js";
import type { RuleInput } from "../rules/rule-model.js";
import type { StageModel } from "../stages/stage-model.js";
import type { ControllerTurnOff } from "../checks/reverse-path.js";

/** A stage's design review and the rule input mapped from it, exactly as the review procedure forms them. */
export interface Assessment {
  readonly review: CandidateReview;
  readonly input: RuleInput;
}

/** Reviews a (trial) stage against the requirement; supplied by the caller so sizing and review agree. */
export type Assess = (stage: StageModel) => Assessment;

/** The reverse-current event the controller's turn-off delay is sized for, and its limits. */
export interface TurnOffSizing {
  readonly loopResistanceOhm: number;
  readonly loopInductanceH: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  /** Output voltage before the event, V, and the input from t = 0 on (0: a short; negative: a reversed level), V. */
  readonly outputV: number;
  readonly inputAfterV: number;
  /** An input decaying from startV to inputAfterV with time constant tauS (TurnOffModel.inputDecay). */
  readonly inputDecay?: { readonly startV: number; readonly tauS: number };
  readonly loadMinV: number;
  readonly tjC: number;
  /** The template's timing: its threshold and gate discharge are held, its delay is what is sized. */
  readonly timing: ControllerTurnOff;
  /** The gate threshold's shift for the event (datasheet minimum − typical, 0 or less; absent: 0), V. */
  readonly thresholdShiftV?: number;
  /** The template's own turn-off delay, s, when it states one. */
  readonly templateDelayS?: number;
  readonly clampV?: number;
  readonly peakReverseCurrentMaxA?: number;
  readonly absorbedEnergyMaxJ?: number;
}

export interface SizingContext {
  readonly requirement: ReviewRequirement;
  readonly ruleSet: CompiledRuleSet;
  readonly assess: Assess;
  /** The requirement's loss budget, W, used when no rule of the set reads the worst-case loss. */
  readonly lossBudgetW?: number;
  readonly turnOff?: TurnOffSizing;
  /** Why the requirement's turn-off event cannot be run on this part (its review is then without it). */
  readonly eventUnavailable?: string;
  /** Why the turn-off delay cannot be sized for this part (e.g. its trip threshold is unknown). */
  readonly turnOffUnavailable?: string;
}
