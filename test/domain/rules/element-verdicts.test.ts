import { describe, expect, it } from "vitest";
import { compileRuleSet } from "../../../domain/rules/compile-rule-set.js";
import { evaluateRuleSetOverElements } from "../../../domain/rules/element-verdicts.js";
import { evaluateRuleSet } from "../../../domain/rules/evaluate-rules.js";
import type { RuleSet } from "../../../domain/rules/rule-model.js";

// Hand-computed cases (invented numbers): thresholds and margins follow from the expressions.
const SET: RuleSet = {
  id: "elements-test",
  version: "1.0.0",
  description: "test set for evaluation over several elements",
  rules: [
    {
      id: "tj",
      title: "Tj",
      appliesTo: "all",
      expression: "tjWorstC <= part.tjMaxC - 25 K",
      severity: "fail",
      source: "test",
      rationale: "test rule",
    },
    {
      id: "vr",
      title: "VRRM",
      appliesTo: ["pn-diode"],
      expression: "reverseVMaxV <= 0.8 * part.vrrmV",
      severity: "fail",
      source: "test",
      rationale: "test rule",
    },
    {
      id: "ripple",
      title: "ripple",
      appliesTo: "all",
      expression: "capacitorRippleCurrentA <= capacitorRippleRatingA",
      severity: "warn",
      source: "test",
      rationale: "test rule",
    },
    {
      id: "block",
      title: "blocking",
      appliesTo: "all",
      when: "parallelSources or holdUpRequired",
      expression: "blocksReverseCurrent",
      severity: "fail",
      source: "test",
      rationale: "test rule",
    },
  ],
};
const compiled = (() => {
  const r = compileRuleSet(SET);
  if (!r.ok) throw new Error("test set does not compile");
  return r.compiled;
})();

describe("a rule set over several elements", () => {
  const shared = { capacitorRippleCurrentA: 2, capacitorRippleRatingA: 2.5 };
  const elements = [
    {
      element: "line1High",
      input: {
        stageKind: "pn-diode",
        metrics: { ...shared, tjWorstC: 100, reverseVMaxV: 30 },
        part: { tjMaxC: 150, vrrmV: 40 },
      },
    },
    // tj threshold 150 − 25 = 125: 120 leaves 5 K, the least of the elements; VRRM 0.8·40 = 32 < 34: fails.
    {
      element: "line2High",
      input: {
        stageKind: "pn-diode",
        metrics: { ...shared, tjWorstC: 120, reverseVMaxV: 34 },
        part: { tjMaxC: 150, vrrmV: 40 },
      },
    },
    // A MOSFET element: out of scope of the diode rule; Tj threshold 175 − 25 = 150, margin 40.
    {
      element: "line1Low",
      input: {
        stageKind: "nfet-ideal-diode",
        metrics: { ...shared, tjWorstC: 110, reverseVMaxV: 34 },
        part: { tjMaxC: 175, vdsMaxV: 60 },
      },
    },
  ];
  const r = evaluateRuleSetOverElements(compiled, elements);
  const v = (id: string) => r.verdicts.find((x) => x.ruleId === id);

  it("shows the worst element per rule, named in element and at the head of the reason", () => {
    expect(v("vr")?.outcome).toBe("fail");
    expect(v("vr")?.element).toBe("line2High");
    expect(v("vr")?.margin).toBeCloseTo(-2, 12);
    expect(v("vr")?.reason).toMatch(/^line2High: reverseVMaxV = 34 V <= 32 V does not hold/);
    expect(r.outcome).toBe("fail");
  });

  it("among passing elements shows the one with the least relative margin", () => {
    // Relative margins: 25/125 = 0.2, 5/125 = 0.04, 40/150 = 0.267 → line2High.
    expect(v("tj")?.outcome).toBe("pass");
    expect(v("tj")?.element).toBe("line2High");
    expect(v("tj")?.threshold).toBeCloseTo(125, 12);
  });

  it("names no element when every element gives the same verdict on the same values", () => {
    expect(v("ripple")?.outcome).toBe("pass");
    expect(v("ripple")?.element).toBeUndefined();
    expect(v("ripple")?.margin).toBeCloseTo(0.5, 12);
  });

  it("a gap on one element outranks a pass on the others (the circuit is not proven)", () => {
    const first = elements[0];
    if (first === undefined) throw new Error("elements");
    const gap = evaluateRuleSetOverElements(compiled, [
      first,
      { element: "line2Low", input: { stageKind: "pn-diode", metrics: shared, part: { tjMaxC: 150, vrrmV: 40 } } },
    ]);
    const tj = gap.verdicts.find((x) => x.ruleId === "tj");
    expect(tj?.notApplicableCode).toBe("missing-value");
    expect(tj?.element).toBe("line2Low");
    expect(gap.outcome).toBe("incomplete");
  });
});

describe("a precondition on requirement flags left out (three-valued)", () => {
  const metrics = {
    blocksReverseCurrent: false,
    holdUpRequired: true,
    capacitorRippleCurrentA: 1,
    capacitorRippleRatingA: 2,
    tjWorstC: 50,
    reverseVMaxV: 10,
  };
  const part = { tjMaxC: 150, vrrmV: 40 };
  it("is true whichever way the missing flag goes: 'parallelSources or true' is evaluated", () => {
    const r = evaluateRuleSet(compiled, {
      stageKind: "pn-diode",
      metrics,
      part,
      notRequired: { parallelSources: "not stated" },
    });
    const b = r.verdicts.find((x) => x.ruleId === "block");
    expect(b?.outcome).toBe("fail");
  });
  it("depends on the missing flag: out of scope (not-required), not a gap", () => {
    const r = evaluateRuleSet(compiled, {
      stageKind: "pn-diode",
      metrics: { ...metrics, holdUpRequired: false },
      part,
      notRequired: { parallelSources: "not stated" },
    });
    const b = r.verdicts.find((x) => x.ruleId === "block");
    expect(b?.notApplicableCode).toBe("not-required");
    expect(b?.reason).toContain("parallelSources (not stated)");
    expect(r.outcome).toBe("pass");
  });
  it("a missing flag that is not declared stays a gap", () => {
    const r = evaluateRuleSet(compiled, {
      stageKind: "pn-diode",
      metrics: { ...metrics, holdUpRequired: false },
      part,
    });
    expect(r.verdicts.find((x) => x.ruleId === "block")?.notApplicableCode).toBe("missing-value");
    expect(r.outcome).toBe("incomplete");
  });
});
