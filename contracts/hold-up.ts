import { z } from "zod";
import { load } from "./load.js";
import { provenance } from "./outcome.js";
import { metricRecord, ruleSetResultSchema } from "./rule-set.js";
import { ruleSetRef } from "./rules.js";
import { quantity, temperatureC } from "./quantity.js";
import { stageInput } from "./stage.js";
import { fallingInputFields, holdUpCapacitor, refineInputFalls } from "./turn-off.js";

const { stage: _s, outputV: _o, capacitor: _c, load: _l, loadMinV: _m, tjC: _t, ...fallFields } = fallingInputFields;

export const holdUpInput = z
  .strictObject({
    stages: z
      .array(stageInput)
      .min(1)
      .max(20)
      .meta({ description: "the stage kinds to compare, each on the same output" }),
    outputV: quantity("V", "output voltage when the input is lost", { gt: 0, le: 10_000 }),
    capacitor: holdUpCapacitor,
    load,
    loadMinV: quantity("V", "the load's minimum operating voltage (default: a constant-power load's minVoltageV)", {
      ge: 0,
      le: 10_000,
    }).optional(),
    tjC: temperatureC("junction temperature of the stages (sets the reverse leakage)"),
    requiredHoldUpS: quantity("s", "hold-up the design must achieve (for the metric holdUpMarginS)", {
      ge: 0,
      le: 1e6,
    }).optional(),
    input: z
      .discriminatedUnion("kind", [
        z
          .strictObject({ kind: z.literal("open") })
          .meta({ description: "the input is disconnected: nothing flows back" }),
        z
          .strictObject({ kind: z.literal("falls"), ...fallFields })
          .meta({ description: "the input is shorted or steps lower through a loop" }),
      ])
      .meta({ description: "how the input is lost" }),
    ruleSet: ruleSetRef.optional().meta({
      description:
        "when given, the result carries this rule set's verdicts (docs/metrics.md lists what this analysis provides)",
    }),
    ruleMetrics: metricRecord.optional().meta({
      description:
        "requirement metrics for the rules that this analysis does not compute (parallelSources, reverseVMaxV, reverseCurrentBudgetA, ...)",
    }),
  })
  .superRefine((v, ctx) => {
    if (v.input.kind === "falls") refineInputFalls({ ...v.input, outputV: v.outputV }, ctx, ["input"]);
  })
  .meta({ description: "time the output stays above the load's minimum after the input is lost, per stage" });
export type HoldUpInput = z.input<typeof holdUpInput>;

export const holdUpMetrics = z.object({
  holdUpS: z.number().optional().meta({ description: "absent when the output is never interrupted" }),
  holdUpMarginS: z.number().optional(),
  blocksReverseCurrent: z.boolean(),
  reverseLeakageA: z.number().optional(),
});

const row = z.discriminatedUnion("outcome", [
  z.object({
    outcome: z.literal("holds"),
    holdUpS: z.number(),
    eventS: z.number(),
    dischargeS: z.number(),
    method: z.string(),
    reverseLeakageA: z.number(),
    startCapacitorV: z.number(),
  }),
  z.object({
    outcome: z.literal("drains-back"),
    holdUpS: z.number(),
    reason: z.string(),
    peakReverseCurrentA: z.number(),
    outputMinV: z.number().meta({
      description: "the output's lowest voltage over the event (below 0 V: a negative input pulled it there)",
    }),
    channelOffS: z
      .number()
      .optional()
      .meta({ description: "when a P-FET's gate turned its channel off (absent: it stays on)" }),
  }),
  z.object({ outcome: z.literal("not-interrupted"), reason: z.string(), settlesAtV: z.number().optional() }),
  z.object({ outcome: z.literal("no-hold-up"), reason: z.string(), startOutputV: z.number().optional() }),
]);

export const holdUpOutput = z.object({
  ...provenance,
  assumptions: z.array(z.string()),
  stages: z.array(
    z.object({
      stage: z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() }),
      result: row,
      meetsRequirement: z.boolean().optional().meta({
        description:
          "present when requiredHoldUpS is given: whether the hold-up reaches it (an outcome of holds or drains-back says only how long the output stays up; never interrupted meets it, no hold-up does not)",
      }),
      requirementReason: z.string().optional().meta({
        description: "the hold-up against the requirement, in words with units (present with meetsRequirement)",
      }),
      metrics: holdUpMetrics,
      rules: ruleSetResultSchema
        .optional()
        .meta({ description: "verdicts of the named rule set on this stage (present when ruleSet was given)" }),
    }),
  ),
});
export type HoldUpOutput = z.infer<typeof holdUpOutput>;
