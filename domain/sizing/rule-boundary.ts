import type { CompiledRule, CompiledRuleSet } from "../rules/compile-rule-set.js";
import { evaluateRule } from "../rules/evaluate-rules.js";
import type { RuleInput, Verdict } from "../rules/rule-model.js";
import type { Bound } from "./spec-item.js";

/** A rule read as a bound on one of its names, with the other names held at their values. */
export type RuleBoundary =
  | { readonly kind: "bound"; readonly bound: Bound; readonly value: number; readonly atLimit: Verdict }
  /** The rule does not apply to this stage or requirement (kind, precondition false, a budget not set). */
  | { readonly kind: "out-of-scope"; readonly reason: string }
  /** It applies, but cannot be read as a threshold on the name (not a comparison, no boundary, a value missing). */
  | { readonly kind: "undetermined"; readonly reason: string };

/** The rule input with one name (a metric, or `part.<name>`) set to x. */
export function withValue(input: RuleInput, name: string, x: number): RuleInput {
  // Object.assign, not a spread followed by fields (V8's slow clone path, ~1 µs per call).
  if (name.startsWith("part."))
    return Object.assign({}, input, { part: Object.assign({}, input.part, { [name.slice(5)]: x }) });
  const unavailable =
    input.unavailable === undefined
      ? undefined
      : Object.fromEntries(Object.entries(input.unavailable).filter(([k]) => k !== name));
  return Object.assign(
    {},
    input,
    { metrics: Object.assign({}, input.metrics, { [name]: x }) },
    unavailable === undefined ? {} : { unavailable },
  );
}

/**
 * The boundary of a comparison rule in one name: the value x* of `name` at which the rule's
 * margin (rhs − lhs for <, <=; lhs − rhs for >, >=) is zero, every other name held. The margin
 * is evaluated by the rule engine itself (so the threshold is exactly what a review reports)
 * and its zero found by secant steps from the present value — one step for the affine rules
 * of the built-in sets, a few for a curved expression. The sign of dmargin/dx says which side
 * passes: rising margin → the name must be at least x*, falling → at most x*.
 */
export function ruleBoundary(
  c: CompiledRule,
  input: RuleInput,
  name: string,
  stamp: CompiledRuleSet["stamp"],
  present: number,
): RuleBoundary {
  // One copy of the input (withValue's) whose entry for `name` each trial overwrites: the engine
  // reads the value at evaluation and keeps no reference to the input, so every trial sees
  // exactly withValue(input, name, x) without copying the metrics again.
  const probe = withValue(input, name, present);
  const target = (name.startsWith("part.") ? probe.part : probe.metrics) as Record<string, number | boolean>;
  const key = name.startsWith("part.") ? name.slice(5) : name;
  const at = (x: number): Verdict => {
    target[key] = x;
    return evaluateRule(c, probe, stamp);
  };
  const v0 = at(present);
  if (v0.outcome === "not-applicable") {
    const code = v0.notApplicableCode;
    const reason = `${c.rule.id}: ${v0.reason ?? "not applicable"}`;
    return code === "stage-kind" || code === "precondition" || code === "not-required"
      ? { kind: "out-of-scope", reason }
      : { kind: "undetermined", reason };
  }
  if (v0.margin === null)
    return {
      kind: "undetermined",
      reason: `${c.rule.id}: '${c.rule.expression}' is not a comparison, so it sets no threshold on ${name}`,
    };
  let x0 = present;
  let m0 = v0.margin;
  let x1 = present + Math.max(Math.abs(present) * 1e-3, 1e-9);
  let m1 = at(x1).margin;
  if (m1 === null) return { kind: "undetermined", reason: `${c.rule.id}: no margin near ${name} = ${x1}` };
  const slope = (m1 - m0) / (x1 - x0);
  if (!(Math.abs(slope) > 0) || !Number.isFinite(slope))
    return { kind: "undetermined", reason: `${c.rule.id}: its margin does not depend on ${name} near ${present}` };
  const bound: Bound = slope > 0 ? "at-least" : "at-most";
  for (let i = 0; i < 60; i += 1) {
    const d = m1 - m0;
    if (d === 0) break;
    const x2 = x1 - (m1 * (x1 - x0)) / d;
    if (!Number.isFinite(x2)) break;
    const v2 = at(x2);
    if (v2.margin === null) break;
    x0 = x1;
    m0 = m1;
    x1 = x2;
    m1 = v2.margin;
    const scale = Math.max(Math.abs(v2.threshold ?? 0), 1e-12);
    if (Math.abs(m1) <= 1e-15 * scale || Math.abs(x1 - x0) <= 1e-14 * Math.max(Math.abs(x1), 1e-300))
      return { kind: "bound", bound, value: x1, atLimit: v2 };
  }
  return { kind: "undetermined", reason: `${c.rule.id}: the secant search for the boundary of ${name} did not settle` };
}

/** The rules of a set that read a name. */
export function rulesReading(set: CompiledRuleSet, name: string): CompiledRule[] {
  return set.rules.filter((r) => r.names.includes(name));
}
