import { describe, expect, it } from "vitest";
import { compileRuleSet } from "../../../domain/rules/compile-rule-set.js";
import type { RuleInput } from "../../../domain/rules/rule-model.js";
import { ruleBoundary } from "../../../domain/sizing/rule-boundary.js";

const set = (expression: string, when?: string) => {
  const out = compileRuleSet({
    id: "t",
    version: "1",
    description: "test",
    rules: [
      {
        id: "r",
        title: "r",
        appliesTo: ["nfet-ideal-diode"],
        expression,
        ...(when === undefined ? {} : { when }),
        severity: "fail",
        source: "test",
        rationale: "test",
      },
    ],
  });
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  return out.compiled;
};
const input: RuleInput = {
  stageKind: "nfet-ideal-diode",
  metrics: { reverseVMaxV: 28, supplyMaxV: 32, transientVMaxV: 58, parallelSources: false, holdUpRequired: false },
  part: { vdsMaxV: 60, maxInputV: 65 },
};

describe("a rule read as a threshold on one name", () => {
  // Closed forms: each boundary solved by hand from the expression.
  it.each([
    { expr: "reverseVMaxV <= 0.8 * part.vdsMaxV", name: "part.vdsMaxV", bound: "at-least", value: 28 / 0.8 },
    { expr: "max(supplyMaxV, transientVMaxV) <= part.maxInputV", name: "part.maxInputV", bound: "at-least", value: 58 },
    { expr: "sqrt(part.vdsMaxV * 1 V) * 2 >= reverseVMaxV", name: "part.vdsMaxV", bound: "at-least", value: 196 },
    { expr: "reverseVMaxV <= 0.8 * part.vdsMaxV", name: "reverseVMaxV", bound: "at-most", value: 48 },
    { expr: "part.vdsMaxV - 5 V >= reverseVMaxV", name: "part.vdsMaxV", bound: "at-least", value: 33 },
  ])("$expr in $name", ({ expr, name, bound, value }) => {
    const s = set(expr);
    const c = s.rules[0];
    if (c === undefined) throw new Error("no rule");
    const present = name.startsWith("part.") ? (input.part[name.slice(5)] ?? 1) : Number(input.metrics[name]);
    const b = ruleBoundary(c, input, name, s.stamp, present);
    expect(b.kind).toBe("bound");
    if (b.kind !== "bound") return;
    expect(b.bound).toBe(bound);
    expect(b.value).toBeCloseTo(value, 9);
  });

  it("a precondition that is false puts the rule out of scope; a logical rule sets no threshold", () => {
    const off = set("reverseVMaxV <= 0.8 * part.vdsMaxV", "parallelSources");
    const c = off.rules[0];
    if (c === undefined) throw new Error("no rule");
    expect(ruleBoundary(c, input, "part.vdsMaxV", off.stamp, 60).kind).toBe("out-of-scope");
    const logical = set("reverseVMaxV <= 0.8 * part.vdsMaxV and supplyMaxV <= part.maxInputV");
    const d = logical.rules[0];
    if (d === undefined) throw new Error("no rule");
    const b = ruleBoundary(d, input, "part.vdsMaxV", logical.stamp, 60);
    expect(b.kind).toBe("undetermined");
  });
});
