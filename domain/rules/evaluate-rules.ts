import type { CompiledRule, CompiledRuleSet, NameRef, ResolvedScratch } from "./compile-rule-set.js";
import type { NotApplicableCode, RuleInput, RuleSetResult, Verdict, VerdictOutcome } from "./rule-model.js";
import { NON_FINITE } from "./sandbox.js";
import { summarizeVerdicts } from "./summarize-verdicts.js";
import { verdict } from "./verdict-literal.js";
import { comparisonReason } from "./verdict-text.js";

type Resolved = ResolvedScratch;

/** Look each name up once; absent or ill-typed is data (the reason), never a throw. */
function resolve(refs: readonly NameRef[], input: RuleInput, R: Resolved): Resolved {
  const metrics = input.metrics;
  const part = input.part;
  for (let i = 0; i < refs.length; i += 1) {
    const ref = refs[i] as NameRef;
    const raw = ref.isPart ? part[ref.key] : metrics[ref.key];
    let ok = 0;
    let v = Number.NaN;
    if (typeof raw === "number" && (!ref.boolean || raw === 0 || raw === 1) && Number.isFinite(raw)) {
      ok = 1;
      v = raw;
    } else if (typeof raw === "boolean" && ref.boolean) {
      ok = 1;
      v = raw ? 1 : 0;
    }
    R.ok[i] = ok;
    R.v[i] = v;
  }
  return R;
}

function whyAbsent(ref: NameRef, src: Readonly<Record<string, number | boolean>>, input: RuleInput): string {
  if (!Object.hasOwn(src, ref.key)) {
    const u =
      input.unavailable !== undefined && Object.hasOwn(input.unavailable, ref.name)
        ? input.unavailable[ref.name]
        : undefined;
    return u === undefined ? `${ref.name} is not given` : `${ref.name} is not available: ${u}`;
  }
  const raw = src[ref.key];
  return ref.boolean
    ? `${ref.name} is ${String(raw)}; a boolean metric takes true/false or 0/1`
    : `${ref.name} is ${String(raw)}; a finite number is required`;
}

const NONE_MISSING: readonly string[] = [];

/** Fill slot values for one expression (idx: positions in the rule's names, map: rule name → R). */
function fillSlots(out: number[], R: Resolved, map: readonly number[], idx: readonly number[]): number[] {
  for (let k = 0; k < idx.length; k += 1) out[k] = R.v[map[idx[k] as number] as number] as number;
  return out;
}

/** Whether every name an expression reads is present. */
function allPresent(R: Resolved, map: readonly number[], idx: readonly number[]): boolean {
  for (let k = 0; k < idx.length; k += 1) if (R.ok[map[idx[k] as number] as number] !== 1) return false;
  return true;
}

/** Why the names an expression reads are absent (empty when every one is present). */
function missingOf(
  R: Resolved,
  refs: readonly NameRef[],
  input: RuleInput,
  map: readonly number[],
  idx: readonly number[],
): readonly string[] {
  let missing: string[] | undefined;
  for (let k = 0; k < idx.length; k += 1) {
    const j = map[idx[k] ?? -1] ?? -1;
    if (R.ok[j] !== 1) {
      missing ??= [];
      const ref = refs[idx[k] ?? -1];
      missing.push(
        ref === undefined
          ? "internal: slot out of range"
          : whyAbsent(ref, ref.isPart ? input.part : input.metrics, input),
      );
    }
  }
  return missing ?? NONE_MISSING;
}

/**
 * Evaluate one compiled rule: coverage of the stage kind, then the `when` precondition, then
 * the condition. For a top-level comparison the threshold is the right-hand side's value and
 * the margin is rhs − lhs for `<`/`<=` (lhs − rhs for `>`/`>=`), relative to |threshold|.
 */
export function evaluateRule(c: CompiledRule, input: RuleInput, stamp: CompiledRuleSet["stamp"]): Verdict {
  return evaluateResolved(c, input, resolve(c.refs, input, c.work.own), c.ownIndex, stamp);
}

/** Names the caller left out on purpose (notRequired) that this rule needs. */
function skippedNames(c: CompiledRule, input: RuleInput, R: Resolved, map: readonly number[]): string[] {
  const optional = input.notRequired;
  if (optional === undefined) return [];
  return c.names.filter((n, i) => Object.hasOwn(optional, n) && R.ok[map[i] ?? -1] !== 1);
}

function notRequiredReason(input: RuleInput, names: readonly string[]): string {
  return `not required: ${names.map((n) => `${n} (${input.notRequired?.[n] ?? ""})`).join("; ")}`;
}

function valuesOf(c: CompiledRule, R: Resolved, map: readonly number[]): Record<string, number | boolean> {
  const vals: Record<string, number | boolean> = {};
  const names = c.names;
  const refs = c.refs;
  for (let i = 0; i < names.length; i += 1) {
    const j = map[i] as number;
    if (R.ok[j] === 1) vals[names[i] as string] = (refs[i] as NameRef).boolean ? R.v[j] === 1 : (R.v[j] as number);
  }
  return vals;
}

function notApplicable(
  c: CompiledRule,
  vals: Readonly<Record<string, number | boolean>>,
  code: NotApplicableCode,
  reason: string,
  stamp: CompiledRuleSet["stamp"],
): Verdict {
  return verdict(c, vals, "not-applicable", null, 0, 0, reason, code, stamp);
}

function evaluateResolved(
  c: CompiledRule,
  input: RuleInput,
  R: Resolved,
  map: readonly number[],
  stamp: CompiledRuleSet["stamp"],
): Verdict {
  const r = c.rule;
  const vals = valuesOf(c, R, map);
  if (r.appliesTo !== "all") {
    if (input.stageKind === undefined)
      return notApplicable(
        c,
        vals,
        "missing-value",
        `the rule covers ${c.coverText} and no stage kind was given`,
        stamp,
      );
    if (!r.appliesTo.includes(input.stageKind))
      return notApplicable(c, vals, "stage-kind", `the rule covers ${c.coverText}, not ${input.stageKind}`, stamp);
  }
  const buf = c.work;
  try {
    if (c.when !== null) {
      const wSlots = fillSlots(buf.when, R, map, c.whenSlots);
      let holds: boolean | undefined;
      if (!allPresent(R, map, c.whenSlots)) {
        // A precondition on requirement inputs the caller left out: decided if it has the same
        // value whichever way the missing flags go ("parallelSources or holdUpRequired" with
        // holdUpRequired true), otherwise the rule is out of scope; a gap elsewhere stays a gap.
        const whenNames = new Set(c.whenSlots.map((i) => c.names[i]));
        const skipped = skippedNames(c, input, R, map).filter((n) => whenNames.has(n));
        holds = skipped.length > 0 ? preconditionOverFlags(c, R, map, wSlots) : undefined;
        if (holds === undefined) {
          if (skipped.length > 0)
            return notApplicable(c, vals, "not-required", notRequiredReason(input, skipped), stamp);
          return notApplicable(
            c,
            vals,
            "missing-value",
            `precondition '${r.when}' cannot be evaluated: ${missingOf(R, c.refs, input, map, c.whenSlots).join("; ")}`,
            stamp,
          );
        }
      } else holds = c.when.test(wSlots);
      if (!holds) return notApplicable(c, vals, "precondition", `precondition '${r.when}' is false`, stamp);
    }
    if (!allPresent(R, map, c.expressionSlots)) {
      const skipped = skippedNames(c, input, R, map);
      if (skipped.length > 0) return notApplicable(c, vals, "not-required", notRequiredReason(input, skipped), stamp);
      return notApplicable(
        c,
        vals,
        "missing-value",
        `cannot be evaluated: ${missingOf(R, c.refs, input, map, c.expressionSlots).join("; ")}`,
        stamp,
      );
    }
    const slots = fillSlots(buf.expr, R, map, c.expressionSlots);
    const cmp = c.expression.comparison;
    if (cmp === null) {
      const holds = c.expression.test(slots);
      return verdict(
        c,
        vals,
        holds ? "pass" : r.severity,
        null,
        0,
        0,
        holds ? null : `'${r.expression}' is false`,
        null,
        stamp,
      );
    }
    // A top-level comparison: both sides once, the condition from them (the same tree as test()).
    const lhs = cmp.lhs(slots);
    const rhs = cmp.rhs(slots);
    const holds = cmp.op === "<" ? lhs < rhs : cmp.op === "<=" ? lhs <= rhs : cmp.op === ">" ? lhs > rhs : lhs >= rhs;
    const outcome: VerdictOutcome = holds ? "pass" : r.severity;
    const margin = cmp.bound === "upper" ? rhs - lhs : lhs - rhs;
    const reason = holds ? null : comparisonReason(r.expression, c.expression.names, cmp.op, lhs, rhs, margin);
    return verdict(c, vals, outcome, cmp.op, rhs, margin, reason, null, stamp);
  } catch (err) {
    if (err === NON_FINITE)
      return notApplicable(
        c,
        vals,
        "not-finite",
        "an intermediate value is not finite (division by zero, log of zero or a negative number, overflow)",
        stamp,
      );
    throw err;
  }
}

/**
 * Three-valued precondition: when every missing slot is a boolean, try both values of each (at
 * most 4 of them); the result when all agree, undefined when they do not or a missing slot is a
 * number.
 */
function preconditionOverFlags(
  c: CompiledRule,
  R: Resolved,
  map: readonly number[],
  slots: readonly number[],
): boolean | undefined {
  const when = c.when;
  if (when === null) return undefined;
  const free: number[] = [];
  c.whenSlots.forEach((nameIdx, k) => {
    const j = map[nameIdx] ?? -1;
    if (R.ok[j] !== 1) free.push(k);
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

/**
 * Evaluate every rule of a set, in the set's order. The set's outcome: fail if any rule failed,
 * else warn if any warned, else incomplete if any rule could not be evaluated (a missing or
 * non-finite value), else pass; not-applicable when no rule was in scope at all.
 */
export function evaluateRuleSet(set: CompiledRuleSet, input: RuleInput): RuleSetResult {
  const R = resolve(set.refs, input, set.work);
  const rules = set.rules;
  const verdicts = new Array<Verdict>(rules.length);
  for (let i = 0; i < rules.length; i += 1) {
    const c = rules[i] as CompiledRule;
    verdicts[i] = evaluateResolved(c, input, R, c.setIndex, set.stamp);
  }
  return summarizeVerdicts(set.stamp, verdicts);
}
