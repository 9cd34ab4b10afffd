import { describe, expect, it } from "vitest";
import { compileRuleSet, formatRuleLoadError } from "../../../domain/rules/compile-rule-set.js";
import { evaluateRuleSet } from "../../../domain/rules/evaluate-rules.js";
import type { Rule, RuleSet } from "../../../domain/rules/rule-model.js";

const rule = (id: string, expression: string, extra: Partial<Rule> = {}): Rule => ({
  id,
  title: id,
  appliesTo: "all",
  expression,
  severity: "fail",
  source: "test",
  rationale: "test rule",
  ...extra,
});
const setOf = (...rules: Rule[]): RuleSet => ({ id: "t", version: "1", description: "test set", rules });
const compiled = (s: RuleSet) => {
  const c = compileRuleSet(s);
  if (!c.ok) throw new Error(c.errors.map(formatRuleLoadError).join("; "));
  return c.compiled;
};

describe("rule evaluation", () => {
  it("a comparison a <= b reports threshold b, margin b − a and margin / |b|", () => {
    const [v] = evaluateRuleSet(compiled(setOf(rule("r", "dropWorstV <= 500 mV"))), {
      metrics: { dropWorstV: 0.4 },
      part: {},
    }).verdicts;
    expect(v?.outcome).toBe("pass");
    expect(v?.threshold).toBe(0.5);
    expect(v?.margin).toBeCloseTo(0.1, 15);
    expect(v?.relativeMargin).toBeCloseTo(0.2, 15);
    expect(v?.values).toEqual({ dropWorstV: 0.4 });
  });
  it("a threshold of 0 gives a margin and no relative margin", () => {
    const [v] = evaluateRuleSet(compiled(setOf(rule("r", "quiescentA <= 0"))), {
      metrics: { quiescentA: 1e-6 },
      part: {},
    }).verdicts;
    expect(v?.outcome).toBe("fail");
    expect(v?.margin).toBeCloseTo(-1e-6, 20);
    expect(v?.relativeMargin).toBeNull();
  });
  it("a non-finite intermediate (division by zero, log of 0) is not applicable, never a pass or NaN", () => {
    const res = evaluateRuleSet(
      compiled(setOf(rule("div", "dropWorstV / lossWorstW <= 100"), rule("log", "log(lossWorstW / lossBudgetW) <= 1"))),
      { metrics: { dropWorstV: 0.5, lossWorstW: 0, lossBudgetW: 1 }, part: {} },
    );
    expect(res.verdicts.map((v) => v.outcome)).toEqual(["not-applicable", "not-applicable"]);
    expect(res.verdicts[0]?.reason).toContain("not finite");
    expect(res.outcome).toBe("incomplete");
    expect(res.verdicts[0]?.notApplicableCode).toBe("not-finite");
    expect(JSON.stringify(res)).not.toMatch(/NaN|Infinity|null,"margin":NaN/);
  });
  it("a boolean metric given as 0.5 or a number metric given as a boolean is not applicable with the reason", () => {
    const res = evaluateRuleSet(compiled(setOf(rule("b", "blocksReverseCurrent"), rule("n", "tjWorstC <= 100"))), {
      metrics: { blocksReverseCurrent: 0.5, tjWorstC: true },
      part: {},
    });
    expect(res.verdicts[0]?.reason).toContain("blocksReverseCurrent is 0.5");
    expect(res.verdicts[1]?.reason).toContain("tjWorstC is true");
  });
  it("a rule limited to stage kinds is not applicable when no stage kind is given", () => {
    const [v] = evaluateRuleSet(compiled(setOf(rule("k", "tjWorstC <= 100", { appliesTo: ["pn-diode"] }))), {
      metrics: { tjWorstC: 1 },
      part: {},
    }).verdicts;
    expect(v?.outcome).toBe("not-applicable");
    expect(v?.reason).toContain("no stage kind was given");
  });
  it("the summary: fail beats warn beats pass; counts every outcome", () => {
    const s = compiled(
      setOf(
        rule("a", "tjWorstC <= 100"),
        rule("b", "tjWorstC <= 50", { severity: "warn" }),
        rule("c", "lossWorstW <= 1"),
      ),
    );
    expect(evaluateRuleSet(s, { metrics: { tjWorstC: 60 }, part: {} })).toMatchObject({
      outcome: "warn",
      counts: { pass: 1, warn: 1, fail: 0, notApplicable: 1 },
    });
    expect(evaluateRuleSet(s, { metrics: { tjWorstC: 160, lossWorstW: 0.5 }, part: {} })).toMatchObject({
      outcome: "fail",
      counts: { pass: 1, warn: 1, fail: 1, notApplicable: 0 },
    });
    expect(evaluateRuleSet(s, { metrics: { tjWorstC: 10 }, part: {} })).toMatchObject({
      outcome: "incomplete",
      counts: { pass: 2, notApplicable: 1 },
    });
    const scoped = compiled(setOf(rule("d", "tjWorstC <= 1", { appliesTo: ["pn-diode"] })));
    expect(evaluateRuleSet(scoped, { stageKind: "pfet-high-side", metrics: {}, part: {} }).outcome).toBe(
      "not-applicable",
    );
  });
  it("a name marked unavailable says why in the reason", () => {
    const [v] = evaluateRuleSet(compiled(setOf(rule("u", "tjWorstC <= 100"))), {
      metrics: {},
      part: {},
      unavailable: { tjWorstC: "no stable operating point (thermal runaway)" },
    }).verdicts;
    expect(v?.reason).toBe(
      "cannot be evaluated: tjWorstC is not available: no stable operating point (thermal runaway)",
    );
    expect(v?.notApplicableCode).toBe("missing-value");
  });
});

describe("compileRuleSet: load errors name the rule, the field and the column", () => {
  it("collects every error of a set, each with rule id and position", () => {
    const out = compileRuleSet(
      setOf(
        rule("ok", "tjWorstC <= 1"),
        rule("typo", "tjWorstC <= part.tjMax"),
        rule("when-bad", "tjWorstC <= 1", { when: "import(1)" }),
        rule("kind", "tjWorstC <= 1", { appliesTo: ["tube-rectifier"] }),
        rule("ok", "tjWorstC <= 2"),
      ),
    );
    if (out.ok) throw new Error("expected errors");
    expect(out.errors.map(formatRuleLoadError)).toEqual([
      "rule typo, expression column 13: unknown part parameter 'part.tjMax' (see docs/metrics.md)",
      "rule when-bad, when column 1: function 'import' is refused in the rules sandbox",
      expect.stringContaining("rule kind, appliesTo: unknown stage kind 'tube-rectifier'"),
      "rule ok, id: rule id 'ok' appears more than once",
    ]);
  });
});

describe("requirement inputs left out on purpose", () => {
  it("puts a rule that needs one out of scope (not-required), without making the set incomplete", async () => {
    const { builtInRuleSets } = await import("../../../domain/rules/built-in-sets.js");
    const set = builtInRuleSets().find((s) => s.stamp.id === "default");
    if (set === undefined) throw new Error("default set");
    const metrics = {
      quiescentA: 1e-4,
      tjWorstC: 80,
      lossWorstW: 0.1,
      dropWorstV: 0.02,
      loadVMinV: 11,
      supplyMinV: 9,
      supplyMaxV: 16,
      reverseVMaxV: 14,
      reverseTransientVMaxV: 20,
      transientVMaxV: 30,
      gateDriveMinV: 10,
      startVoltageV: 3,
      startChatter: false,
      blocksReverseCurrent: true,
      parallelSources: false,
      holdUpRequired: false,
    };
    const part = { tjMaxC: 175, vdsMaxV: 60, vgsMaxV: 20, vgsOnV: 10, maxInputV: 65, controllerReverseRatingV: 65 };
    // The reverse-current and bridge analyses' own metrics are out of scope here as well.
    const { ANALYSIS_ONLY_METRICS } = await import("../../../domain/rules/rule-input-draft.js");
    const elsewhere = Object.fromEntries(
      Object.values(ANALYSIS_ONLY_METRICS).flatMap((names) => names.map((n) => [n, "another analysis"])),
    );
    const r = evaluateRuleSet(set, {
      stageKind: "nfet-ideal-diode",
      metrics,
      part,
      notRequired: {
        ...elsewhere,
        standbyBudgetA: "no budget set",
        lossBudgetW: "no budget set",
        loadMinV: "no minimum given",
      },
    });
    const standby = r.verdicts.find((v) => v.ruleId === "standby-quiescent");
    expect(standby?.notApplicableCode).toBe("not-required");
    expect(r.outcome).toBe("pass");
    // The same gap without the declaration is a gap in the evidence.
    const gap = evaluateRuleSet(set, { stageKind: "nfet-ideal-diode", metrics, part });
    expect(gap.outcome).toBe("incomplete");
  });
});
