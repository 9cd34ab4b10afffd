import { describe, expect, it } from "vitest";
import { putPeakReverse } from "../../domain/rules/rule-input-draft.js";
import { compileRuleSet } from "../../domain/rules/compile-rule-set.js";
import { evaluateRuleSet } from "../../domain/rules/evaluate-rules.js";

// A reverse peak that is only a lower bound (the current still rising at the end of the searched
// span) must not let a rule on the peak pass: it is unavailable, with the bound in the reason.
describe("turn-off reverse peak as a rule metric", () => {
  const compiled = compileRuleSet({
    id: "t",
    version: "1",
    description: "test set",
    rules: [
      {
        id: "peak",
        title: "peak",
        appliesTo: "all",
        expression: "peakReverseCurrentA <= 200",
        severity: "fail",
        source: "test",
        rationale: "test rule",
      },
    ],
  });
  if (!compiled.ok) throw new Error("rule set did not compile");
  const verdictOf = (r: { peakReverseCurrentA: number; peakReverseIsLowerBound?: true }) => {
    const metrics: Record<string, number | boolean> = {};
    const unavailable: Record<string, string> = {};
    putPeakReverse(r, metrics, unavailable);
    return { metrics, unavailable, result: evaluateRuleSet(compiled.compiled, { metrics, part: {}, unavailable }) };
  };

  it("the maximum is the metric, and the rule passes on it", () => {
    const v = verdictOf({ peakReverseCurrentA: 138.1 });
    expect(v.metrics["peakReverseCurrentA"]).toBe(138.1);
    expect(v.result.verdicts[0]?.outcome).toBe("pass");
  });

  it("a lower bound is unavailable with the bound in the reason: the set is incomplete, not passed", () => {
    const v = verdictOf({ peakReverseCurrentA: 134.5, peakReverseIsLowerBound: true });
    expect(v.metrics["peakReverseCurrentA"]).toBeUndefined();
    expect(v.unavailable["peakReverseCurrentA"]).toContain("134.5 A is only a lower bound");
    expect(v.result.outcome).not.toBe("pass");
    expect(v.result.verdicts[0]?.outcome).not.toBe("pass");
  });
});
