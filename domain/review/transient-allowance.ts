import type { TransientAllowance } from "../checks/transient-stress.js";
import type { ReviewRequirement } from "./candidate-review.js";
import type { CompiledRuleSet } from "../rules/compile-rule-set.js";
import type { RuleInput } from "../rules/rule-model.js";
import { ruleBoundary, rulesReading } from "../sizing/rule-boundary.js";
import type { StageModel } from "../stages/stage-model.js";
import { partParameters, stageMetrics } from "../rules/metrics-of-operating-point.js";
import { mosfetBreakdownColdV } from "../checks/breakdown-temperature.js";

/** A MOSFET's breakdown at the coldest ambient, which a rule on reverseTransientVMaxV may read (as the review's rule input has it). */
function coldBreakdown(stage: StageModel, req: ReviewRequirement): Record<string, number> {
  const v = mosfetBreakdownColdV(stage, req.ambientMinC);
  return v === undefined ? {} : { vdsBreakdownColdV: v };
}

/**
 * The transient allowances a rule set grants a stage: the largest negative-pulse stress on the
 * blocking element, input peak and gate-source peak that every applicable rule on
 * reverseTransientVMaxV, transientVMaxV and gateSourceVMaxV still passes (each rule read as a
 * bound on that one name, the part's ratings held). The review sizes its clamp window to these,
 * so the window and the verdicts agree; a name no rule bounds keeps rating × derating.
 */
export function transientAllowanceOf(
  set: CompiledRuleSet,
  stage: StageModel,
  req: ReviewRequirement,
): TransientAllowance {
  const base: RuleInput = {
    stageKind: stage.kind,
    // stageMetrics is a fresh record (no spread clone: V8's slow path once fields follow it).
    metrics: Object.assign(
      stageMetrics(stage),
      { supplyMinV: req.supplyMinV, supplyMaxV: req.supplyMaxV, reverseVMaxV: req.reverseV },
      coldBreakdown(stage, req),
    ),
    part: partParameters(stage),
  };
  // Probe above the steady supply: a rule like max(supplyMaxV, transientVMaxV) <= rating is flat below it.
  const probe = Math.max(2 * req.supplyMaxV, 2 * req.reverseV, 1);
  const largest = (name: string): number | undefined => {
    let best: number | undefined;
    for (const rule of rulesReading(set, name)) {
      // A rule for other stage kinds is out of scope for ruleBoundary too (skipped below): skip it here.
      if (rule.rule.appliesTo !== "all" && !rule.rule.appliesTo.includes(stage.kind)) continue;
      // ruleBoundary sets `name` itself for every trial, starting at the probe.
      const b = ruleBoundary(rule, base, name, set.stamp, probe);
      if (b.kind === "bound" && b.bound === "at-most" && b.value > 0)
        best = best === undefined ? b.value : Math.min(best, b.value);
    }
    return best;
  };
  const blocking = largest("reverseTransientVMaxV");
  const input = largest("transientVMaxV");
  const gateSource = largest("gateSourceVMaxV");
  return {
    ...(blocking === undefined ? {} : { blocking }),
    ...(input === undefined ? {} : { input }),
    ...(gateSource === undefined ? {} : { gateSource }),
  };
}
