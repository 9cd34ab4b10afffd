import { z } from "zod";
import "./zod-messages.js";
import { METRICS, PART_PARAMETERS } from "../domain/rules/metric-vocabulary.js";
import type { Rule, RuleSet } from "../domain/rules/rule-model.js";
import { LIMITS, limitMessage } from "./limits.js";

/**
 * Rule sets as files and requests carry them. The shape is checked here; the expressions, the
 * stage kinds and the ids are checked by the domain (compileRuleSet), whose errors name the rule
 * and the column in the expression.
 */
export const ruleSchema = z.strictObject({
  id: z.string().regex(/^[A-Za-z0-9][A-Za-z0-9._-]{0,79}$/, "a rule id is 1-80 letters, digits, '.', '_' or '-'"),
  title: z.string().min(1).max(200),
  appliesTo: z
    .union([z.literal("all"), z.array(z.string()).min(1)])
    .meta({ description: 'stage kinds the rule covers, or "all"' }),
  when: z.string().optional().meta({ description: "precondition; false makes the rule not applicable" }),
  expression: z
    .string()
    .meta({ description: "condition over the metric vocabulary, mathjs syntax, e.g. tjWorstC <= part.tjMaxC - 25 K" }),
  severity: z.enum(["fail", "warn"]).meta({ description: "outcome when the condition is false" }),
  source: z
    .string()
    .min(1)
    .max(500)
    .meta({ description: 'a standard clause, "common practice", "memory", or the company policy' }),
  rationale: z.string().min(1).max(1000),
});

export const ruleSetSchema = z.strictObject({
  id: z.string().regex(/^[A-Za-z0-9][A-Za-z0-9._-]{0,79}$/, "a rule-set id is 1-80 letters, digits, '.', '_' or '-'"),
  version: z.string().min(1).max(40),
  description: z.string().min(1).max(4000),
  basedOn: z.string().max(80).optional(),
  differences: z.array(z.string().max(2000)).optional(),
  rules: z.array(ruleSchema).min(1).max(500),
});
export type RuleSetSpec = z.infer<typeof ruleSetSchema>;

/** The zod output to the domain record (optional members absent rather than undefined). */
export function toRuleSet(s: RuleSetSpec): RuleSet {
  const rules: Rule[] = s.rules.map((r) => ({
    id: r.id,
    title: r.title,
    appliesTo: r.appliesTo,
    ...(r.when === undefined ? {} : { when: r.when }),
    expression: r.expression,
    severity: r.severity,
    source: r.source,
    rationale: r.rationale,
  }));
  return {
    id: s.id,
    version: s.version,
    description: s.description,
    ...(s.basedOn === undefined ? {} : { basedOn: s.basedOn }),
    ...(s.differences === undefined ? {} : { differences: s.differences }),
    rules,
  };
}

const metricNames = METRICS.map((m) => m.name);
const partNames = PART_PARAMETERS.map((m) => m.name);

/**
 * Values by vocabulary name: a strict object with every name optional, so a name outside the
 * vocabulary (a typo would leave a rule not applicable) is zod's unknown key, refused with the
 * nearest name, and `__proto__` and the like are refused like any other (a zod record drops them
 * silently). More names than any record may hold are one limit issue for the record (the answer
 * then reports the limit alone). Its output is a record of the names given.
 */
function vocabularyRecord<V extends z.ZodType>(names: readonly string[], value: V) {
  const shape = Object.fromEntries(names.map((n) => [n, value.optional()]));
  return z
    .strictObject(shape)
    .check((ctx) => {
      // the names given: the known ones kept in the value and the unknown ones zod listed
      const unknown = ctx.issues.find((i) => i.code === "unrecognized_keys" && (i.path?.length ?? 0) === 0);
      const n = Object.keys(ctx.value).length + (unknown?.code === "unrecognized_keys" ? unknown.keys.length : 0);
      if (n > LIMITS.maxMetrics)
        ctx.issues.push({
          code: "custom",
          input: ctx.value,
          path: [],
          message: limitMessage("maxMetrics", `the record holds ${n} names`),
        });
    })
    .transform((o) => o as Record<string, z.output<V>>);
}

/** Metric values by name (docs/metrics.md). */
export const metricRecord = vocabularyRecord(
  metricNames,
  z.union([z.number().finite("must be a finite number"), z.boolean()], {
    error: "expected a number in the metric's unit (SI, docs/metrics.md) or true/false",
  }),
);
export const partRecord = vocabularyRecord(
  partNames,
  z
    .number({ error: "expected a number in the parameter's unit (SI, docs/metrics.md)" })
    .finite("must be a finite number"),
);

export const ruleSetStamp = z.object({
  id: z.string(),
  version: z.string(),
  hash: z.string().meta({ description: "sha256 of the set's canonical JSON" }),
});

export const verdictSchema = z.object({
  ruleId: z.string(),
  title: z.string(),
  outcome: z.enum(["pass", "warn", "fail", "not-applicable"]),
  severity: z.enum(["fail", "warn"]),
  expression: z.string(),
  values: z
    .record(z.string(), z.union([z.number(), z.boolean()]))
    .meta({ description: "every name the rule read, part parameters as part.<name>" }),
  comparison: z.string().nullable(),
  threshold: z.number().nullable(),
  margin: z
    .number()
    .nullable()
    .meta({ description: "distance to the threshold on the safe side; negative when violated" }),
  relativeMargin: z.number().nullable(),
  source: z.string(),
  rationale: z.string(),
  reason: z.string().nullable(),
  notApplicableCode: z
    .enum(["stage-kind", "precondition", "not-required", "missing-value", "not-finite"])
    .nullable()
    .meta({ description: "why not applicable: out of scope, or a gap in the evidence" }),
  ruleSet: ruleSetStamp,
  element: z.string().optional().meta({
    description:
      "for a circuit of several elements (bridge positions, ORing branches): the worst element, whose values the verdict shows",
  }),
});

export const ruleSetResultSchema = z.object({
  ruleSet: ruleSetStamp,
  outcome: z.enum(["pass", "warn", "fail", "incomplete", "not-applicable"]).meta({
    description: "fail > warn > incomplete (a rule could not be evaluated) > pass; not-applicable: no rule in scope",
  }),
  counts: z.object({ pass: z.number(), warn: z.number(), fail: z.number(), notApplicable: z.number() }),
  verdicts: z.array(verdictSchema).readonly(),
});
