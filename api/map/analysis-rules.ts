import type { RuleSetSpec } from "../../contracts/rule-set.js";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import { METRICS } from "../../domain/rules/metric-vocabulary.js";
import type { RuleInput } from "../../domain/rules/rule-model.js";
import type { Context } from "../context.js";
import { inputProblem } from "../input-problem.js";
import { resolveRuleSet } from "./rule-set.js";

/** What an analysis puts into a rule input before its scope is closed. */
export interface RuleInputDraft {
  readonly stageKind: string;
  readonly metrics: Record<string, number | boolean>;
  readonly part: Record<string, number>;
  readonly unavailable: Record<string, string>;
  readonly notRequired: Record<string, string>;
}

export function draft(stageKind: string, callerMetrics: Readonly<Record<string, number | boolean>>, part: Record<string, number>): RuleInputDraft {
  return { stageKind, metrics: { ...callerMetrics }, part, unavailable: {}, notRequired: {} };
}

/**
 * Close the scope of an analysis: every vocabulary metric that it did not compute, that the
 * stage does not describe and that the caller did not give in ruleMetrics is out of scope
 * ("not-required", citing the analysis), so the operating-point and design-review rules of a
 * set do not make every verdict of this analysis "incomplete". Names the analysis should have
 * computed but could not are in `unavailable` and stay gaps.
 */
export function closeScope(d: RuleInputDraft, analysis: string): RuleInput {
  const notRequired = { ...d.notRequired };
  for (const m of METRICS) {
    const n = m.name;
    if (Object.hasOwn(d.metrics, n) || Object.hasOwn(d.unavailable, n) || Object.hasOwn(notRequired, n)) continue;
    notRequired[n] = `not computed by ${analysis}; give it in ruleMetrics where it applies`;
  }
  return { stageKind: d.stageKind, metrics: d.metrics, part: d.part, unavailable: d.unavailable, notRequired };
}

/**
 * The rule set a request names, after checking that ruleMetrics leaves out the names the
 * analysis computes (a caller's value would otherwise overwrite, or be overwritten by, the
 * computed one without notice).
 */
export function ruleSetForAnalysis(
  ref: string | RuleSetSpec | undefined,
  callerMetrics: Readonly<Record<string, number | boolean>> | undefined,
  computed: readonly string[],
  analysis: string,
  ctx: Context,
): CompiledRuleSet | undefined {
  for (const n of computed) {
    if (callerMetrics !== undefined && Object.hasOwn(callerMetrics, n)) throw inputProblem("invalid-input", ["ruleMetrics", n], `${n} is computed by ${analysis}; leave it out of ruleMetrics`);
  }
  return ref === undefined ? undefined : resolveRuleSet(ref, ctx, ["ruleSet"]);
}

/**
 * Metrics that only one analysis computes (with the requirement inputs that only its rules
 * read): the design review's steady-reverse, clamp and start-profile figures, the reverse-current
 * and bridge analyses'. Elsewhere rules on them are out of scope, not gaps.
 */
export const ANALYSIS_ONLY_METRICS: Readonly<Record<string, readonly string[]>> = {
  review: [
    "reverseTjC",
    "reverseLeakageRunaway",
    "controllerReverseVMaxV",
    "clampEnergyJ",
    "clampPeakCurrentA",
    "clampPeakPowerW",
    "clampPeakPowerAllowedW",
    "clampStandoffV",
    "clampEnergyRatingJ",
    "clampPeakCurrentRatingA",
    "jumpStartV",
    "supplyOvervoltageV",
    "startProfileMinV",
    "startProfileDropoutS",
  ],
  turnOff: ["peakReverseCurrentA", "absorbedEnergyJ", "eventTjC"],
  holdUp: ["holdUpS", "holdUpRequiredS"],
  oring: ["reverseCurrentA", "reverseCurrentBudgetA"],
  batteryCharge: ["targetCanDrainSource"],
  bridgeAc: ["peakRepetitiveCurrentA", "capacitorRippleCurrentA", "capacitorRippleRatingA"],
};

/** notRequired entries for the analysis-only metrics the caller did not give, naming where each comes from. */
export function otherAnalysesMetrics(given: Readonly<Record<string, number | boolean>>, here: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [analysis, names] of Object.entries(ANALYSIS_ONLY_METRICS)) {
    for (const n of names) if (!Object.hasOwn(given, n)) out[n] = `computed by ${analysis}, not by ${here}`;
  }
  return out;
}

/** Put a number, or mark it unavailable with why when the analysis has none. */
export function putOr(d: RuleInputDraft, name: string, value: number | boolean | undefined, whyNot: string): void {
  if (value === undefined) d.unavailable[name] = whyNot;
  else d.metrics[name] = value;
}
