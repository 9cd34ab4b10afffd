/**
 * Rules and verdicts. A rule is a condition over the metric vocabulary (metric-vocabulary.ts) in
 * the sandboxed mathjs syntax (sandbox.ts), e.g. `tjWorstC <= part.tjMaxC - 25`. When the
 * condition is false the verdict is the rule's severity; when a name it needs is absent, or the
 * rule does not cover the stage kind, or its `when` condition is false, the verdict is
 * "not-applicable" with the reason. A rule never passes without being evaluated.
 */
export type Severity = "fail" | "warn";
export type VerdictOutcome = "pass" | "warn" | "fail" | "not-applicable";
/**
 * Why a rule was not applicable: out of scope ("stage-kind", "precondition" false) or a gap in
 * the evidence ("missing-value": a name it needs is absent or ill-typed; "not-finite": an
 * intermediate value overflowed or divided by zero). A gap makes the set's outcome "incomplete".
 */
export type NotApplicableCode = "stage-kind" | "precondition" | "not-required" | "missing-value" | "not-finite";
/** fail > warn > incomplete (a rule could not be evaluated) > pass; not-applicable: no rule was in scope. */
export type RuleSetOutcome = "pass" | "warn" | "fail" | "incomplete" | "not-applicable";

export interface Rule {
  readonly id: string;
  readonly title: string;
  /** Stage kinds the rule covers, or "all". */
  readonly appliesTo: "all" | readonly string[];
  /** Optional precondition; false makes the rule not applicable (e.g. `parallelSources or holdUpRequired`). */
  readonly when?: string;
  readonly expression: string;
  readonly severity: Severity;
  /** A standard's clause, "common practice", "memory", or the company's policy. */
  readonly source: string;
  readonly rationale: string;
}

export interface RuleSet {
  readonly id: string;
  readonly version: string;
  readonly description: string;
  /** The set this one derives from, and what it changes and why. */
  readonly basedOn?: string;
  readonly differences?: readonly string[];
  readonly rules: readonly Rule[];
}

/** Identity of the rule set stamped on every verdict: id, version and sha256 of its canonical JSON. */
export interface RuleSetStamp {
  readonly id: string;
  readonly version: string;
  readonly hash: string;
}

export interface Verdict {
  readonly ruleId: string;
  readonly title: string;
  readonly outcome: VerdictOutcome;
  readonly severity: Severity;
  readonly expression: string;
  /** Every vocabulary name the rule read that was present, by name (sorted); part parameters as part.<name>. */
  readonly values: Readonly<Record<string, number | boolean>>;
  /** For a top-level comparison: the operator, the right-hand side's value and the margin. */
  readonly comparison: string | null;
  readonly threshold: number | null;
  /** Distance to the threshold on the safe side (rhs − lhs for <, <=; lhs − rhs for >, >=); negative when violated. */
  readonly margin: number | null;
  /** margin / |threshold|, null when the threshold is 0. */
  readonly relativeMargin: number | null;
  readonly source: string;
  readonly rationale: string;
  /** Why the rule did not pass or was not applicable; null on pass. */
  readonly reason: string | null;
  readonly notApplicableCode: NotApplicableCode | null;
  readonly ruleSet: RuleSetStamp;
  /**
   * When the rule was evaluated on each of several elements (bridge positions, ORing branches):
   * the element whose verdict this is, the worst of them (element-verdicts.ts). Absent for a
   * single stage, or when every element gave the same verdict on the same values.
   */
  readonly element?: string;
}

export interface RuleSetResult {
  readonly ruleSet: RuleSetStamp;
  readonly outcome: RuleSetOutcome;
  readonly counts: {
    readonly pass: number;
    readonly warn: number;
    readonly fail: number;
    readonly notApplicable: number;
  };
  readonly verdicts: readonly Verdict[];
}

/** What rules are evaluated against. Booleans may be given as true/false or 0/1. */
export interface RuleInput {
  readonly stageKind?: string;
  readonly metrics: Readonly<Record<string, number | boolean>>;
  readonly part: Readonly<Record<string, number>>;
  /** Names known to be unavailable, with why (e.g. no operating point exists); cited in the reason. */
  readonly unavailable?: Readonly<Record<string, string>>;
  /**
   * Requirement inputs the caller left out on purpose (a budget not set), with why: a rule that
   * needs one is out of scope ("not-required"), not a gap in the evidence.
   */
  readonly notRequired?: Readonly<Record<string, string>>;
}
