import type { CompiledRule, CompiledRuleSet } from "./compile-rule-set.js";
import { metricDef, partParameterDef } from "./metric-vocabulary.js";
import type { NotApplicableCode, RuleInput, RuleSetOutcome, RuleSetResult, Verdict, VerdictOutcome } from "./rule-model.js";
import { NON_FINITE } from "./sandbox.js";

type Lookup = { readonly ok: true; readonly v: number; readonly boolean: boolean } | { readonly ok: false; readonly why: string };

/** Value of one vocabulary name in the input, booleans as 0/1; absent or ill-typed is data. */
function lookup(input: RuleInput, name: string): Lookup {
  const isPart = name.startsWith("part.");
  const key = isPart ? name.slice(5) : name;
  const src: Readonly<Record<string, number | boolean>> = isPart ? input.part : input.metrics;
  if (!Object.hasOwn(src, key)) {
    const u = input.unavailable !== undefined && Object.hasOwn(input.unavailable, name) ? input.unavailable[name] : undefined;
    return { ok: false, why: u === undefined ? `${name} is not given` : `${name} is not available: ${u}` };
  }
  const raw = src[key];
  const def = isPart ? partParameterDef(key) : metricDef(key);
  if (def?.type === "boolean") {
    if (raw === true || raw === 1) return { ok: true, v: 1, boolean: true };
    if (raw === false || raw === 0) return { ok: true, v: 0, boolean: true };
    return { ok: false, why: `${name} is ${String(raw)}; a boolean metric takes true/false or 0/1` };
  }
  if (typeof raw !== "number" || !Number.isFinite(raw)) return { ok: false, why: `${name} is ${String(raw)}; a finite number is required` };
  return { ok: true, v: raw, boolean: false };
}

/** Slot values for one expression; the reasons for the names that are absent or ill-typed. */
function gather(looked: readonly Lookup[], idx: readonly number[]): { slots: number[]; missing: string[] } {
  const slots: number[] = [];
  const missing: string[] = [];
  for (const i of idx) {
    const l = looked[i];
    if (l?.ok) slots.push(l.v);
    else {
      slots.push(Number.NaN);
      missing.push(l?.why ?? "internal: slot out of range");
    }
  }
  return { slots, missing };
}

/**
 * Evaluate one compiled rule: coverage of the stage kind, then the `when` precondition, then
 * the condition. For a top-level comparison the threshold is the right-hand side's value and
 * the margin is rhs − lhs for `<`/`<=` (lhs − rhs for `>`/`>=`), relative to |threshold|.
 */
export function evaluateRule(c: CompiledRule, input: RuleInput, stamp: CompiledRuleSet["stamp"]): Verdict {
  const r = c.rule;
  const looked = c.names.map((n) => lookup(input, n));
  const vals: Record<string, number | boolean> = {};
  c.names.forEach((n, i) => {
    const l = looked[i];
    if (l?.ok) vals[n] = l.boolean ? l.v === 1 : l.v;
  });
  const base = { ruleId: r.id, title: r.title, severity: r.severity, expression: r.expression, values: vals, source: r.source, rationale: r.rationale };
  const none = { comparison: null, threshold: null, margin: null, relativeMargin: null };
  const na = (code: NotApplicableCode, reason: string): Verdict => ({ ...base, outcome: "not-applicable", ...none, reason, notApplicableCode: code, ruleSet: stamp });
  if (r.appliesTo !== "all") {
    if (input.stageKind === undefined) return na("missing-value", `the rule covers ${r.appliesTo.join(", ")} and no stage kind was given`);
    if (!r.appliesTo.includes(input.stageKind)) return na("stage-kind", `the rule covers ${r.appliesTo.join(", ")}, not ${input.stageKind}`);
  }
  try {
    if (c.when !== null) {
      const w = gather(looked, c.whenSlots);
      if (w.missing.length > 0) return na("missing-value", `precondition '${r.when}' cannot be evaluated: ${w.missing.join("; ")}`);
      if (!c.when.test(w.slots)) return na("precondition", `precondition '${r.when}' is false`);
    }
    const e = gather(looked, c.expressionSlots);
    const optional = input.notRequired;
    const skipped = optional === undefined ? [] : c.names.filter((n) => Object.hasOwn(optional, n) && !looked[c.names.indexOf(n)]?.ok);
    if (skipped.length > 0) return na("not-required", `not required: ${skipped.map((n) => `${n} (${optional?.[n] ?? ""})`).join("; ")}`);
    if (e.missing.length > 0) return na("missing-value", `cannot be evaluated: ${e.missing.join("; ")}`);
    const holds = c.expression.test(e.slots);
    const outcome: VerdictOutcome = holds ? "pass" : r.severity;
    const cmp = c.expression.comparison;
    if (cmp === null) return { ...base, outcome, ...none, reason: holds ? null : `'${r.expression}' is false`, notApplicableCode: null, ruleSet: stamp };
    const lhs = cmp.lhs(e.slots);
    const rhs = cmp.rhs(e.slots);
    const margin = cmp.bound === "upper" ? rhs - lhs : lhs - rhs;
    return {
      ...base,
      outcome,
      comparison: cmp.op,
      threshold: rhs,
      margin,
      relativeMargin: rhs === 0 ? null : margin / Math.abs(rhs),
      reason: holds ? null : `${fmt(lhs)} ${cmp.op} ${fmt(rhs)} does not hold (margin ${fmt(margin)})`,
      notApplicableCode: null,
      ruleSet: stamp,
    };
  } catch (err) {
    if (err === NON_FINITE) return na("not-finite", "an intermediate value is not finite (division by zero, log of zero or a negative number, overflow)");
    throw err;
  }
}

/**
 * Evaluate every rule of a set, in the set's order. The set's outcome: fail if any rule failed,
 * else warn if any warned, else incomplete if any rule could not be evaluated (a missing or
 * non-finite value), else pass; not-applicable when no rule was in scope at all.
 */
export function evaluateRuleSet(set: CompiledRuleSet, input: RuleInput): RuleSetResult {
  const verdicts = set.rules.map((c) => evaluateRule(c, input, set.stamp));
  const counts = { pass: 0, warn: 0, fail: 0, notApplicable: 0 };
  let gaps = 0;
  for (const v of verdicts) {
    if (v.outcome === "not-applicable") {
      counts.notApplicable += 1;
      if (v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite") gaps += 1;
    } else counts[v.outcome] += 1;
  }
  const outcome: RuleSetOutcome = counts.fail > 0 ? "fail" : counts.warn > 0 ? "warn" : gaps > 0 ? "incomplete" : counts.pass > 0 ? "pass" : "not-applicable";
  return { ruleSet: set.stamp, outcome, counts, verdicts };
}

function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}
