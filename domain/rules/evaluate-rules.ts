import type { CompiledRule, CompiledRuleSet, NameRef } from "./compile-rule-set.js";
import type { NotApplicableCode, RuleInput, RuleSetOutcome, RuleSetResult, Verdict, VerdictOutcome } from "./rule-model.js";
import { NON_FINITE } from "./sandbox.js";

/** The values of a list of names in one input: present (as 0/1 for booleans) or why not. */
interface Resolved {
  readonly ok: boolean[];
  readonly v: number[];
  readonly out: (number | boolean)[];
  readonly why: string[];
}

/** Look each name up once; absent or ill-typed is data (the reason), never a throw. */
function resolve(refs: readonly NameRef[], input: RuleInput): Resolved {
  const R: Resolved = { ok: [], v: [], out: [], why: [] };
  for (const ref of refs) {
    const src: Readonly<Record<string, number | boolean>> = ref.isPart ? input.part : input.metrics;
    let why = "";
    let v = Number.NaN;
    if (!Object.hasOwn(src, ref.key)) {
      const u = input.unavailable !== undefined && Object.hasOwn(input.unavailable, ref.name) ? input.unavailable[ref.name] : undefined;
      why = u === undefined ? `${ref.name} is not given` : `${ref.name} is not available: ${u}`;
    } else {
      const raw = src[ref.key];
      if (ref.boolean) {
        if (raw === true || raw === 1) v = 1;
        else if (raw === false || raw === 0) v = 0;
        else why = `${ref.name} is ${String(raw)}; a boolean metric takes true/false or 0/1`;
      } else if (typeof raw === "number" && Number.isFinite(raw)) v = raw;
      else why = `${ref.name} is ${String(raw)}; a finite number is required`;
    }
    R.ok.push(why === "");
    R.v.push(v);
    R.out.push(ref.boolean ? v === 1 : v);
    R.why.push(why);
  }
  return R;
}

const NONE_MISSING: readonly string[] = [];

/** Slot values for one expression (idx: positions in the rule's names, map: rule name → R). */
function slotsOf(R: Resolved, map: readonly number[], idx: readonly number[]): number[] {
  const slots = new Array<number>(idx.length);
  for (let k = 0; k < idx.length; k += 1) slots[k] = R.v[map[idx[k] ?? -1] ?? -1] ?? Number.NaN;
  return slots;
}

/** Why the names an expression reads are absent (empty when every one is present). */
function missingOf(R: Resolved, map: readonly number[], idx: readonly number[]): readonly string[] {
  let missing: string[] | undefined;
  for (let k = 0; k < idx.length; k += 1) {
    const j = map[idx[k] ?? -1] ?? -1;
    if (R.ok[j] !== true) {
      missing ??= [];
      missing.push(R.why[j] ?? "internal: slot out of range");
    }
  }
  return missing ?? NONE_MISSING;
}

function gather(R: Resolved, map: readonly number[], idx: readonly number[]): { slots: number[]; missing: readonly string[] } {
  return { slots: slotsOf(R, map, idx), missing: missingOf(R, map, idx) };
}

/**
 * Evaluate one compiled rule: coverage of the stage kind, then the `when` precondition, then
 * the condition. For a top-level comparison the threshold is the right-hand side's value and
 * the margin is rhs − lhs for `<`/`<=` (lhs − rhs for `>`/`>=`), relative to |threshold|.
 */
export function evaluateRule(c: CompiledRule, input: RuleInput, stamp: CompiledRuleSet["stamp"]): Verdict {
  return evaluateResolved(c, input, resolve(c.refs, input), c.ownIndex, stamp);
}

/** "a, b, c" of a rule's stage kinds, formed once per compiled rule (hot path of not-applicable verdicts). */
const coverTexts = new WeakMap<CompiledRule, string>();
function coverText(c: CompiledRule): string {
  let t = coverTexts.get(c);
  if (t === undefined) {
    t = c.rule.appliesTo === "all" ? "all" : c.rule.appliesTo.join(", ");
    coverTexts.set(c, t);
  }
  return t;
}

/** Names the caller left out on purpose (notRequired) that this rule needs. */
function skippedNames(c: CompiledRule, input: RuleInput, R: Resolved, map: readonly number[]): string[] {
  const optional = input.notRequired;
  if (optional === undefined) return [];
  return c.names.filter((n, i) => Object.hasOwn(optional, n) && R.ok[map[i] ?? -1] !== true);
}

function notRequiredReason(input: RuleInput, names: readonly string[]): string {
  return `not required: ${names.map((n) => `${n} (${input.notRequired?.[n] ?? ""})`).join("; ")}`;
}

function evaluateResolved(c: CompiledRule, input: RuleInput, R: Resolved, map: readonly number[], stamp: CompiledRuleSet["stamp"]): Verdict {
  const r = c.rule;
  const vals: Record<string, number | boolean> = {};
  for (let i = 0; i < c.names.length; i += 1) {
    const j = map[i] ?? -1;
    const name = c.names[i];
    if (R.ok[j] === true && name !== undefined) vals[name] = R.out[j] ?? Number.NaN;
  }
  const na = (code: NotApplicableCode, reason: string): Verdict => verdict(c, vals, "not-applicable", null, 0, 0, reason, code, stamp);
  if (r.appliesTo !== "all") {
    if (input.stageKind === undefined) return na("missing-value", `the rule covers ${coverText(c)} and no stage kind was given`);
    if (!r.appliesTo.includes(input.stageKind)) return na("stage-kind", `the rule covers ${coverText(c)}, not ${input.stageKind}`);
  }
  try {
    if (c.when !== null) {
      const w = gather(R, map, c.whenSlots);
      let holds: boolean | undefined;
      if (w.missing.length > 0) {
        // A precondition on requirement inputs the caller left out: decided if it has the same
        // value whichever way the missing flags go ("parallelSources or holdUpRequired" with
        // holdUpRequired true), otherwise the rule is out of scope; a gap elsewhere stays a gap.
        const whenNames = new Set(c.whenSlots.map((i) => c.names[i]));
        const skipped = skippedNames(c, input, R, map).filter((n) => whenNames.has(n));
        holds = skipped.length > 0 ? preconditionOverFlags(c, R, map, w.slots) : undefined;
        if (holds === undefined) {
          if (skipped.length > 0) return na("not-required", notRequiredReason(input, skipped));
          return na("missing-value", `precondition '${r.when}' cannot be evaluated: ${w.missing.join("; ")}`);
        }
      } else holds = c.when.test(w.slots);
      if (!holds) return na("precondition", `precondition '${r.when}' is false`);
    }
    const missing = missingOf(R, map, c.expressionSlots);
    if (missing.length > 0) {
      const skipped = skippedNames(c, input, R, map);
      if (skipped.length > 0) return na("not-required", notRequiredReason(input, skipped));
      return na("missing-value", `cannot be evaluated: ${missing.join("; ")}`);
    }
    const slots = slotsOf(R, map, c.expressionSlots);
    const cmp = c.expression.comparison;
    if (cmp === null) {
      const holds = c.expression.test(slots);
      return verdict(c, vals, holds ? "pass" : r.severity, null, 0, 0, holds ? null : `'${r.expression}' is false`, null, stamp);
    }
    // A top-level comparison: both sides once, the condition from them (the same tree as test()).
    const lhs = cmp.lhs(slots);
    const rhs = cmp.rhs(slots);
    const holds = cmp.op === "<" ? lhs < rhs : cmp.op === "<=" ? lhs <= rhs : cmp.op === ">" ? lhs > rhs : lhs >= rhs;
    const outcome: VerdictOutcome = holds ? "pass" : r.severity;
    const margin = cmp.bound === "upper" ? rhs - lhs : lhs - rhs;
    const reason = holds ? null : `${fmt(lhs)} ${cmp.op} ${fmt(rhs)} does not hold (margin ${fmt(margin)})`;
    return verdict(c, vals, outcome, cmp.op, rhs, margin, reason, null, stamp);
  } catch (err) {
    if (err === NON_FINITE) return na("not-finite", "an intermediate value is not finite (division by zero, log of zero or a negative number, overflow)");
    throw err;
  }
}

/**
 * Three-valued precondition: when every missing slot is a boolean, try both values of each (at
 * most 4 of them); the result when all agree, undefined when they do not or a missing slot is a
 * number.
 */
function preconditionOverFlags(c: CompiledRule, R: Resolved, map: readonly number[], slots: readonly number[]): boolean | undefined {
  const when = c.when;
  if (when === null) return undefined;
  const free: number[] = [];
  c.whenSlots.forEach((nameIdx, k) => {
    const j = map[nameIdx] ?? -1;
    if (R.ok[j] !== true) free.push(k);
  });
  if (free.length > 4 || free.some((k) => c.refs[c.whenSlots[k] ?? -1]?.boolean !== true)) return undefined;
  let seen: boolean | undefined;
  for (let bits = 0; bits < 1 << free.length; bits += 1) {
    const trial = [...slots];
    free.forEach((k, b) => {
      trial[k] = (bits >> b) & 1;
    });
    const v = when.test(trial);
    if (seen !== undefined && v !== seen) return undefined;
    seen = v;
  }
  return seen;
}

/** One literal with a fixed key order (stable JSON, and one object shape for the engine). */
function verdict(
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

/**
 * Evaluate every rule of a set, in the set's order. The set's outcome: fail if any rule failed,
 * else warn if any warned, else incomplete if any rule could not be evaluated (a missing or
 * non-finite value), else pass; not-applicable when no rule was in scope at all.
 */
export function evaluateRuleSet(set: CompiledRuleSet, input: RuleInput): RuleSetResult {
  const R = resolve(set.refs, input);
  return summarizeVerdicts(set.stamp, set.rules.map((c) => evaluateResolved(c, input, R, c.setIndex, set.stamp)));
}

/** The set's counts and outcome from its verdicts (fail > warn > incomplete > pass; not-applicable). */
export function summarizeVerdicts(stamp: CompiledRuleSet["stamp"], verdicts: readonly Verdict[]): RuleSetResult {
  const counts = { pass: 0, warn: 0, fail: 0, notApplicable: 0 };
  let gaps = 0;
  for (const v of verdicts) {
    if (v.outcome === "not-applicable") {
      counts.notApplicable += 1;
      if (v.notApplicableCode === "missing-value" || v.notApplicableCode === "not-finite") gaps += 1;
    } else counts[v.outcome] += 1;
  }
  const outcome: RuleSetOutcome = counts.fail > 0 ? "fail" : counts.warn > 0 ? "warn" : gaps > 0 ? "incomplete" : counts.pass > 0 ? "pass" : "not-applicable";
  return { ruleSet: stamp, outcome, counts, verdicts };
}

function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}
