import { z } from "zod";
import { STAGE_KIND_LIST } from "../domain/rules/metric-vocabulary.js";
import { provenance } from "./outcome.js";
import { metricRecord, partRecord, ruleSetResultSchema, ruleSetSchema } from "./rule-set.js";

/** A rule set named by id (built-in or loaded from the rules folder), or given inline. */
export const ruleSetRef = z
  .union([z.string().min(1).max(80), ruleSetSchema])
  .meta({ description: "a rule-set id (rules.list shows them) or a whole rule set inline" });

const stageKind = z.enum(STAGE_KIND_LIST as [string, ...string[]]);

export const rulesEvaluateInput = z
  .strictObject({
    ruleSet: ruleSetRef,
    stageKind: stageKind.optional().meta({ description: "rules limited to stage kinds are not applicable without it" }),
    metrics: metricRecord.meta({
      description: "metric values by vocabulary name, SI units (docs/metrics.md); booleans as true/false or 0/1",
    }),
    part: partRecord.default({}).meta({ description: "part parameters by name, read in rules as part.<name>" }),
  })
  .meta({ description: "evaluate a rule set against metrics computed elsewhere" });
export type RulesEvaluateInput = z.input<typeof rulesEvaluateInput>;

export const rulesEvaluateOutput = z.object({ ...provenance, result: ruleSetResultSchema });

const metricDefSchema = z.object({
  name: z.string(),
  type: z.enum(["number", "boolean"]),
  unit: z.string(),
  meaning: z.string(),
  stageKinds: z.union([z.literal("all"), z.array(z.string())]),
  providedBy: z.string(),
});

export const rulesListInput = z.strictObject({}).optional();
export const rulesListOutput = z.object({
  ruleSets: z.array(
    z.object({
      id: z.string(),
      version: z.string(),
      hash: z.string(),
      description: z.string(),
      basedOn: z.string().optional(),
      rules: z.number(),
    }),
  ),
  refused: z
    .array(
      z.object({
        file: z.string(),
        setId: z.string().optional(),
        problems: z.array(z.object({ message: z.string() })),
      }),
    )
    .meta({
      description: "rule-set files refused at load, with why",
    }),
  metrics: z.array(metricDefSchema),
  partParameters: z.array(metricDefSchema),
});

export const rulesShowInput = z.strictObject({ id: z.string().min(1).max(80) });
export const rulesShowOutput = z.object({
  ruleSet: ruleSetSchema,
  stamp: z.object({ id: z.string(), version: z.string(), hash: z.string() }),
});
