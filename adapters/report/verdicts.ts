import { formatQuantity } from "../../domain/rules/quantity-text.js";
import { comparisonText, unitOf } from "../../domain/rules/verdict-text.js";
import type { Verdict } from "./format.js";

/** Fail first, then warn, then gaps in the evidence, then pass, then rules out of scope. */
function group(v: Verdict): number {
  if (v.outcome === "fail") return 0;
  if (v.outcome === "warn") return 1;
  if (v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite") return 2;
  if (v.outcome === "pass") return 3;
  return 4;
}

/** The candidate's verdicts in reading order (stable within a group: the rule set's order). */
export function orderedVerdicts(c: { readonly rules: { readonly verdicts: readonly Verdict[] } }): Verdict[] {
  return c.rules.verdicts
    .map((v, i) => ({ v, i }))
    .sort((a, b) => group(a.v) - group(b.v) || a.i - b.i)
    .map((e) => e.v);
}

/** "tjWorstC = 157.8 °C, part.tjMaxC = 175 °C" in the order the rule read them (key order is stable), units from the vocabulary. */
export function valuesText(v: Verdict): string {
  const entries = Object.entries(v.values);
  return entries.length === 0
    ? "(no values)"
    : entries
        .map(([k, x]) => `${k} = ${typeof x === "boolean" ? String(x) : formatQuantity(x, unitOf(k) ?? "")}`)
        .join(", ");
}

/** Threshold and margin of a comparison, or the reason a rule was not applied. */
export function marginText(v: Verdict): string {
  if (v.outcome === "not-applicable") return `not applicable (${v.notApplicableCode ?? "?"}): ${v.reason ?? ""}`;
  if (v.threshold === null) return v.reason ?? v.outcome;
  const rel = v.relativeMargin === null ? "" : ` (${formatQuantity(v.relativeMargin * 100, "", 3)} %)`;
  const t = comparisonText(v.expression, Object.keys(v.values));
  return `threshold ${v.comparison ?? ""} ${formatQuantity(v.threshold, t?.unit ?? "")}, margin ${v.margin === null ? "-" : formatQuantity(v.margin, t?.marginUnit ?? "")}${rel}`;
}

/** Out of scope, not a gap: a stage kind the rule does not cover, a false precondition, a requirement not set. */
export function outOfScope(v: Verdict): boolean {
  return (
    v.outcome === "not-applicable" && v.notApplicableCode !== "missing-value" && v.notApplicableCode !== "not-finite"
  );
}

/** One line for the rules out of scope, grouped by why ("stage kind: a, b; not required: c"). */
export function outOfScopeSummary(vs: readonly Verdict[]): string {
  const by = new Map<string, string[]>();
  for (const v of vs) by.set(v.notApplicableCode ?? "?", [...(by.get(v.notApplicableCode ?? "?") ?? []), v.ruleId]);
  return [...by.entries()].map(([code, ids]) => `${code}: ${ids.join(", ")}`).join("; ");
}

export function outcomeLabel(o: string): string {
  return o.toUpperCase();
}
