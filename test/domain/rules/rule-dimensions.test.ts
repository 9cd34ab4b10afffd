import { describe, expect, it } from "vitest";
import { ruleSetFromData } from "../../../adapters/rulesets/parse-rule-set.js";
import { compileRuleSet } from "../../../domain/rules/compile-rule-set.js";
import { evaluateRuleSet } from "../../../domain/rules/evaluate-rules.js";
import { METRICS, PART_PARAMETERS } from "../../../domain/rules/metric-vocabulary.js";
import { unitDimension } from "../../../domain/rules/unit-dimensions.js";
import type { RuleSet } from "../../../domain/rules/rule-model.js";
import { compileExpression } from "../../../domain/rules/sandbox.js";

/**
 * Rule expressions are dimension-checked at load. Oracle for the accepted ones: the same rule with
 * plain SI numbers (column: where the unit at fault stands) (the convention before units were checked), which must give the same verdict,
 * threshold and margin; °C as an offset scale and K as a difference is the SI convention (the °C
 * is the kelvin shifted by 273.15, a temperature difference has the same size in both; memory).
 */
const setOf = (...expressions: string[]): RuleSet => ({
  id: "units",
  version: "1",
  description: "unit cases",
  rules: expressions.map((expression, i) => ({
    id: `r${i}`,
    title: "t",
    appliesTo: "all",
    expression,
    severity: "fail",
    source: "memory",
    rationale: "r",
  })),
});

describe("every name of the vocabulary has a unit the check knows", () => {
  it.each([...METRICS, ...PART_PARAMETERS].map((m) => [m.name, m.unit] as const))("%s (%s)", (_name, unit) => {
    expect(unitDimension(unit)).toBeDefined();
  });
});

describe("mixed units are refused at load with the rule id and the column", () => {
  it.each([
    [
      "part.tjMaxC - 25 mA (a current from a temperature)",
      "tjWorstC <= part.tjMaxC - 25 mA",
      30,
      /cannot subtract A from a temperature in °C/,
    ],
    ["part.tjMaxC - 25 V", "tjWorstC <= part.tjMaxC - 25 V", 30, /cannot subtract V from a temperature/],
    [
      "423.15 K as an absolute temperature",
      "tjWorstC <= 423.15 K",
      20,
      /K is read as a temperature difference; .*degC/,
    ],
    ["a temperature against volts", "tjWorstC <= supplyMaxV", 13, /compares a temperature in °C with V/],
    ["volts plus amperes", "dropWorstV + quiescentA <= 1", 14, /cannot add A to V/],
    ["two temperatures added", "tjWorstC + part.tjMaxC <= 300", 12, /cannot add two temperatures/],
    ["a temperature scaled", "tjWorstC <= 0.9 * part.tjMaxC", 19, /cannot be multiplied/],
    ["log of watts", "log(lossWorstW) <= 1", 5, /log needs a plain number/],
    ["a unit in the precondition", "quiescentA <= 5 mV", 17, /compares A with V/],
  ])("%s", (_name, expression, column, message) => {
    const out = compileRuleSet(setOf("tjWorstC <= 150", expression));
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.errors).toHaveLength(1);
    expect(out.errors[0]).toMatchObject({ ruleId: "r1", field: "expression", code: "dimension", column });
    expect(out.errors[0]?.message).toMatch(message);
  });

  it("a company rule file is refused naming the rule, the field and the column", () => {
    const r = ruleSetFromData(setOf("tjWorstC <= part.tjMaxC - 25 mA"), "company.json");
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.problems[0]).toMatchObject({
        source: "company.json",
        ruleId: "r0",
        path: ["rules", 0, "expression"],
        column: 30,
      });
    if (!r.ok) expect(r.problems[0]?.message).toMatch(/^rule r0, expression column 30: cannot subtract A/);
  });

  it("a precondition is checked too", () => {
    const set = setOf("tjWorstC <= 150");
    const out = compileRuleSet({
      ...set,
      rules: [{ ...(set.rules[0] as RuleSet["rules"][number]), when: "supplyMaxV > 25 degC" }],
    });
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors[0]).toMatchObject({ field: "when", code: "dimension" });
  });
});

describe("temperature literals: degC is a point, K a difference, with the plain numbers' results", () => {
  const evaluate = (expression: string, metrics: Record<string, number>, part: Record<string, number> = {}) => {
    const out = compileRuleSet(setOf(expression));
    if (!out.ok) throw new Error(out.errors.map((e) => e.message).join("; "));
    const v = evaluateRuleSet(out.compiled, { metrics, part }).verdicts[0];
    return { outcome: v?.outcome, threshold: v?.threshold, margin: v?.margin };
  };

  it.each([
    ["tjWorstC <= 150 degC", "tjWorstC <= 150", { tjWorstC: 156.4 }, {}],
    ["tjWorstC <= 150 degC", "tjWorstC <= 150", { tjWorstC: 120 }, {}],
    ["tjWorstC <= part.tjMaxC - 25 K", "tjWorstC <= part.tjMaxC - 25", { tjWorstC: 156.4 }, { tjMaxC: 175 }],
    ["tjWorstC >= -40 degC", "tjWorstC >= -40", { tjWorstC: -45 }, {}],
    ["tjWorstC - 25 degC <= 100 K", "tjWorstC - 25 <= 100", { tjWorstC: 130 }, {}],
    ["dropWorstV <= 500 mV", "dropWorstV <= 0.5", { dropWorstV: 0.45 }, {}],
    ["quiescentA <= 2 mA", "quiescentA <= 0.002", { quiescentA: 0.0025 }, {}],
  ] as const)("%s agrees with %s", (withUnits, plain, metrics, part) => {
    expect(evaluate(withUnits, metrics, part)).toEqual(evaluate(plain, metrics, part));
  });

  it("tjWorstC <= 150 degC fails a 156.4 °C junction by 6.4 K", () => {
    const r = evaluate("tjWorstC <= 150 degC", { tjWorstC: 156.4 });
    expect(r.outcome).toBe("fail");
    expect(r.threshold).toBe(150);
    expect(r.margin).toBeCloseTo(-6.4, 12);
  });

  it("the built-in derating of avalanche energy (differences of °C over a difference) is accepted", () => {
    expect(
      compileExpression(
        "absorbedEnergyJ <= 0.8 * part.avalancheEnergyJ * (part.tjMaxC - eventTjC) / (part.tjMaxC - 25)",
      ).ok,
    ).toBe(true);
    expect(
      compileExpression("absorbedEnergyJ <= part.avalancheEnergyJ * (part.tjMaxC - eventTjC) / (part.tjMaxC - 25 degC)")
        .ok,
    ).toBe(true);
  });
});
