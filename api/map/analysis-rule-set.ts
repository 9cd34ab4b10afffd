import type { RuleSetSpec } from "../../contracts/rule-set.js";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import type { Context } from "../context.js";
import { inputProblem } from "../input-problem.js";
import { resolveRuleSet } from "./rule-set.js";

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
    if (callerMetrics !== undefined && Object.hasOwn(callerMetrics, n))
      throw inputProblem(
        "invalid-input",
        ["ruleMetrics", n],
        `${n} is computed by ${analysis}; leave it out of ruleMetrics`,
      );
  }
  return ref === undefined ? undefined : resolveRuleSet(ref, ctx, ["ruleSet"]);
}
