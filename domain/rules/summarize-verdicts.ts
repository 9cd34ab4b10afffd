import type { CompiledRuleSet } from "./compile-rule-set.js";
import type { RuleSetOutcome, RuleSetResult, Verdict } from "./rule-model.js";

/** The set's counts and outcome from its verdicts (fail > warn > incomplete > pass; not-applicable). */
export function summarizeVerdicts(stamp: CompiledRuleSet["stamp"], verdicts: readonly Verdict[]): RuleSetResult {
  const counts = { pass: 0, warn: 0, fail: 0, notApplicable: 0 };
  let gaps = 0;
  for (const v of verdicts) {
    if (v.outcome === "not-applicable") {
      counts.notApplicable += 1;
      if (v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite") gaps += 1;
    } else if (v.outcome === "pass") counts.pass += 1;
    else if (v.outcome === "warn") counts.warn += 1;
    else counts.fail += 1;
  }
  const outcome: RuleSetOutcome =
    counts.fail > 0
      ? "fail"
      : counts.warn > 0
        ? "warn"
        : gaps > 0
          ? "incomplete"
          : counts.pass > 0
            ? "pass"
            : "not-applicable";
  return { ruleSet: stamp, outcome, counts, verdicts };
}
