import type { CompiledRuleSet } from "../rules/compile-rule-set.js";
import type { RuleInput } from "../rules/rule-model.js";
import { type RuleBoundary, ruleBoundary, rulesReading } from "./rule-boundary.js";
import { fmt, limitItem, type SpecItem } from "./spec-item.js";

/**
 * The limit every rule of the set that reads `name` puts on it, the strictest first: the
 * smallest of the upper bounds (or the largest of the lower bounds). The other names hold the
 * values of the template's review (`input`), so the limit is what this design needs of a part
 * otherwise like the template. A rule out of scope is skipped; when no rule is in scope the
 * line is "not-required"; when one applies but sets no threshold, "not-determined". Where the
 * template misses a fail-severity bound, the line is the strictest of those (a stricter warn
 * margin would otherwise report a failing part as only warned).
 */
export function ruleLimitItem(
  set: CompiledRuleSet,
  input: RuleInput,
  name: string,
  base: Pick<SpecItem, "id" | "title" | "unit" | "bound">,
  templateValue: number | undefined,
  corner: string,
): SpecItem {
  const present = templateValue ?? 1;
  const found = rulesReading(set, name).map((c) => ({ c, b: ruleBoundary(c, input, name, set.stamp, present) }));
  const bounds = found.filter(
    (f): f is { c: (typeof found)[number]["c"]; b: Extract<RuleBoundary, { kind: "bound" }> } =>
      f.b.kind === "bound" && f.b.bound === base.bound,
  );
  const undetermined = found.filter(
    (f) => f.b.kind === "undetermined" || (f.b.kind === "bound" && f.b.bound !== base.bound),
  );
  if (bounds.length === 0) {
    if (undetermined.length > 0) {
      const why = undetermined
        .map((f) =>
          f.b.kind === "bound"
            ? `${f.c.rule.id}: bounds ${name} from the other side`
            : "reason" in f.b
              ? f.b.reason
              : "",
        )
        .join("; ");
      return { ...base, outcome: "not-determined", reason: why };
    }
    const why = found.map((f) => ("reason" in f.b ? f.b.reason : "")).filter((s) => s !== "");
    return {
      ...base,
      outcome: "not-required",
      reason: why.length > 0 ? why.join("; ") : `no rule of ${set.stamp.id} reads ${name}`,
    };
  }
  const pick = (bs: typeof bounds) =>
    bs.reduce((a, b) => ((base.bound === "at-most" ? b.b.value < a.b.value : b.b.value > a.b.value) ? b : a));
  // The strictest bound, unless the part misses a fail-severity one: then the strictest of those,
  // so that a part the review fails is not reported as only warned (a warn margin being stricter).
  const fails = bounds.filter((f) => f.c.rule.severity === "fail");
  const misses = (f: (typeof bounds)[number]) =>
    templateValue !== undefined && limitItem(base, f.b.value, templateValue, { reason: "" }).meets === false;
  const missedFails = fails.filter(misses);
  const strictest = missedFails.length > 0 ? pick(missedFails) : pick(bounds);
  const r = strictest.c.rule;
  return limitItem(base, strictest.b.value, templateValue, {
    corner,
    source: {
      kind: "rule",
      ruleId: r.id,
      expression: r.expression,
      severity: r.severity,
      threshold: strictest.b.atLimit.threshold,
      ruleSet: set.stamp,
    },
    reason: `${r.id} ('${r.expression}') holds for ${name} ${base.bound === "at-most" ? "≤" : "≥"} ${fmt(strictest.b.value)} ${base.unit}${bounds.length > 1 ? ` (the strictest of ${bounds.map((b) => b.c.rule.id).join(", ")})` : ""}`,
  });
}
