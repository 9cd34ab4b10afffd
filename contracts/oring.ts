import { z } from "zod";
import { load } from "./load.js";
import { provenance } from "./outcome.js";
import { metricRecord, ruleSetResultSchema } from "./rule-set.js";
import { ruleSetRef } from "./rules.js";
import { quantity, temperatureC } from "./quantity.js";
import { stageInput } from "./stage.js";

export const oringSource = z.strictObject({
  name: z.string().min(1).max(200).optional(),
  openCircuitV: quantity("V", "open-circuit voltage of the source", { gt: 0, le: 10_000 }),
  internalResistanceOhm: quantity("ohm", "internal plus wiring resistance of the source (> 0)", { gt: 0, le: 1e6 }),
  currentLimitA: quantity("A", "the source's forward current limit (absent: none)", { gt: 0, le: 1e5 }).optional(),
  stage: stageInput,
});

export const oringInput = z
  .strictObject({
    sources: z.array(oringSource).min(1, { message: "an ORing network needs at least one source" }).max(32),
    load,
    ambientC: temperatureC("ambient temperature"),
    ruleSet: ruleSetRef.optional().meta({
      description:
        "when given, the result carries this rule set's verdicts (docs/metrics.md lists what this analysis provides)",
    }),
    ruleMetrics: metricRecord.optional().meta({
      description:
        "requirement metrics for the rules that this analysis does not compute (parallelSources, reverseVMaxV, reverseCurrentBudgetA, ...)",
    }),
  })
  .meta({ description: "paralleled sources, each through its own stage, into one node with a load" });
export type OringInput = z.input<typeof oringInput>;

export const BRANCH_MODES = [
  "forward",
  "forward-body-diode-subthreshold",
  "idle",
  "reverse-junction-leakage",
  "reverse-channel",
  "reverse-blocked-ideal",
] as const;

export const oringBranch = z.object({
  name: z.string().optional(),
  stage: z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() }),
  currentA: z.number().meta({ description: "into the node; negative: reverse current into the source" }),
  mode: z.enum(BRANCH_MODES),
  forwardMode: z.string().optional(),
  blocks: z
    .boolean()
    .meta({ description: "a reverse current is stopped by a junction or a controller (leakage only)" }),
  reverseCurrentA: z.number().meta({ description: "current flowing backwards into this source (0 when forward)" }),
  stageV: z.number(),
  stageLossW: z.number(),
  resistanceLossW: z.number(),
  limiterLossW: z.number(),
  currentLimited: z.boolean(),
  tjC: z.number(),
  tjMaxC: z.number(),
  share: z.number().meta({ description: "share of the total forward current, 0..1" }),
});

/** Metrics for rules: reverse current into any source, blocking of every branch. */
export const oringMetrics = z.object({
  maxReverseCurrentA: z.number(),
  allReverseBlocked: z.boolean(),
  maxStageTjC: z.number(),
  anyOverTemperature: z.boolean().meta({ description: "a stage's junction lies above its limit" }),
  minShare: z.number().meta({ description: "smallest share among the sources that conduct forward" }),
});

const rules = ruleSetResultSchema.optional().meta({
  description:
    "verdicts of the named rule set on the network, each branch evaluated and the worst shown per rule, named in element (present when ruleSet was given)",
});

export const oringOutput = z.discriminatedUnion("outcome", [
  z.object({
    outcome: z.literal("solved"),
    ...provenance,
    assumptions: z.array(z.string()),
    rules,
    nodeV: z.number(),
    loadCurrentA: z.number(),
    kclResidualA: z.number(),
    totalStageLossW: z.number(),
    totalResistanceLossW: z.number(),
    thermalIterations: z.number(),
    branches: z.array(oringBranch),
    metrics: oringMetrics,
  }),
  z.object({
    outcome: z.literal("load-collapse"),
    ...provenance,
    assumptions: z.array(z.string()),
    rules,
    reason: z.string(),
  }),
  z.object({
    outcome: z.literal("thermal-runaway"),
    ...provenance,
    assumptions: z.array(z.string()),
    rules,
    reason: z.string(),
    lastTjC: z.array(z.number()),
  }),
]);
export type OringOutput = z.infer<typeof oringOutput>;
