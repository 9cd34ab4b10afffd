import type { CompiledRule, CompiledRuleSet } from "./compile-rule-set.js";
import type { NotApplicableCode, Verdict, VerdictOutcome } from "./rule-model.js";

/** One literal with a fixed key order (stable JSON, and one object shape for the engine). */
export function verdict(
  c: CompiledRule,
  values: Readonly<Record<string, number | boolean>>,
  outcome: VerdictOutcome,
  op: string | null,
  threshold: number,
  margin: number,
  reason: string | null,
  notApplicableCode: NotApplicableCode | null,
  ruleSet: CompiledRuleSet["stamp"],
): Verdict {
  const r = c.rule;
  return {
    ruleId: r.id,
    title: r.title,
    outcome,
    severity: r.severity,
    expression: r.expression,
    values,
    comparison: op,
    threshold: op === null ? null : threshold,
    margin: op === null ? null : margin,
    relativeMargin: op === null || threshold === 0 ? null : margin / Math.abs(threshold),
    source: r.source,
    rationale: r.rationale,
    reason,
    notApplicableCode,
    ruleSet,
  };
}
