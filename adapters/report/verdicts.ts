import { num, type Verdict, valueText } from "./format.js";

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

/** "tjWorstC = 157.8, part.tjMaxC = 175" in the order the rule read them (key order is stable). */
export function valuesText(v: Verdict): string {
  const entries = Object.entries(v.values);
  return entries.length === 0 ? "(no values)" : entries.map(([k, x]) => `${k} = ${valueText(x)}`).join(", ");
}

/** Threshold and margin of a comparison, or the reason a rule was not applied. */
export function marginText(v: Verdict): string {
  if (v.outcome === "not-applicable") return `not applicable (${v.notApplicableCode ?? "?"}): ${v.reason ?? ""}`;
  if (v.threshold === null) return v.reason ?? v.outcome;
  const rel = v.relativeMargin === null ? "" : ` (${num(v.relativeMargin * 100, 3)} %)`;
  return `threshold ${v.comparison ?? ""} ${num(v.threshold)}, margin ${num(v.margin)}${rel}`;
}

export function outcomeLabel(o: string): string {
  return o.toUpperCase();
}
