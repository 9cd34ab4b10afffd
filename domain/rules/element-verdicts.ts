import type { CompiledRuleSet } from "./compile-rule-set.js";
import { evaluateRuleSet } from "./evaluate-rules.js";
import { summarizeVerdicts } from "./summarize-verdicts.js";
import type { RuleInput, RuleSetResult, Verdict } from "./rule-model.js";

/** One element of several (a bridge position, an ORing branch) with its own stage kind and values. */
export interface ElementRuleInput {
  readonly element: string;
  readonly input: RuleInput;
}

/**
 * Severity of a verdict for picking the worst element: fail > warn > a gap in the evidence
 * (missing-value, not-finite) > pass > out of scope (stage kind, precondition, not required).
 */
function rank(v: Verdict): number {
  switch (v.outcome) {
    case "fail":
      return 4;
    case "warn":
      return 3;
    case "pass":
      return 1;
    case "not-applicable":
      return v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite" ? 2 : 0;
  }
}

/** Smaller is closer to (or further past) the threshold: the relative margin, else the margin. */
function closeness(v: Verdict): number {
  return v.relativeMargin ?? v.margin ?? 0;
}

function sameVerdict(a: Verdict, b: Verdict): boolean {
  return (
    a.outcome === b.outcome &&
    a.reason === b.reason &&
    a.margin === b.margin &&
    JSON.stringify(a.values) === JSON.stringify(b.values)
  );
}

/**
 * A rule set over several elements of one circuit, one verdict per rule: each rule is evaluated
 * on every element, and the verdict shown is the worst (rank above; among equals the smallest
 * relative margin, then the first element). The verdict names that element in `element` and at
 * the head of its reason — unless every element gave the same verdict on the same values (a
 * circuit-wide rule, or a symmetric circuit), which needs no name. The set's outcome follows
 * from these verdicts as for one stage: the circuit passes a rule only if every element does.
 */
export function evaluateRuleSetOverElements(
  set: CompiledRuleSet,
  elements: readonly ElementRuleInput[],
): RuleSetResult {
  const results = elements.map((e) => evaluateRuleSet(set, e.input).verdicts);
  const verdicts = set.rules.map((_, i): Verdict => {
    let worst: { v: Verdict; element: string } | undefined;
    let allSame = true;
    results.forEach((vs, k) => {
      const v = vs[i];
      const element = elements[k]?.element;
      if (v === undefined || element === undefined) throw new Error("internal: one verdict per rule and element");
      if (worst === undefined) {
        worst = { v, element };
        return;
      }
      if (!sameVerdict(v, worst.v)) allSame = false;
      const dr = rank(v) - rank(worst.v);
      if (dr > 0 || (dr === 0 && closeness(v) < closeness(worst.v))) worst = { v, element };
    });
    if (worst === undefined) throw new Error("internal: evaluateRuleSetOverElements needs at least one element");
    const w: { v: Verdict; element: string } = worst;
    if (allSame && results.length > 1) return w.v;
    return { ...w.v, reason: w.v.reason === null ? null : `${w.element}: ${w.v.reason}`, element: w.element };
  });
  return summarizeVerdicts(set.stamp, verdicts);
}
