import { z } from "zod";
import { provenance } from "./outcome.js";
import { metricRecord, ruleSetResultSchema } from "./rule-set.js";
import { ruleSetRef } from "./rules.js";
import { quantity, ratio, temperatureC } from "./quantity.js";
import { stageInput } from "./stage.js";

export const battery = z
  .strictObject({
    capacityAh: z.number().gt(0).lte(1e6).meta({ description: "capacity", unit: "A·h" }),
    ocvPoints: z
      .array(
        z.strictObject({
          soc: ratio("state of charge", { ge: 0, le: 1 }),
          voltageV: quantity("V", "open-circuit voltage", { gt: 0, le: 10_000 }),
        }),
      )
      .min(2)
      .max(200)
      .meta({
        description: "open-circuit voltage against state of charge: SoC strictly increasing, voltage not decreasing",
      }),
    internalResistanceOhm: quantity("ohm", "internal resistance (plus wiring)", { gt: 0, le: 1e3 }),
    initialSoc: ratio("state of charge at the start", { ge: 0, le: 1 }),
  })
  .superRefine((b, ctx) => {
    b.ocvPoints.forEach((p, i) => {
      const prev = b.ocvPoints[i - 1];
      if (prev === undefined) return;
      if (!(p.soc > prev.soc))
        ctx.addIssue({
          code: "custom",
          path: ["ocvPoints", i, "soc"],
          message: "state of charge must increase strictly",
        });
      if (p.voltageV < prev.voltageV)
        ctx.addIssue({
          code: "custom",
          path: ["ocvPoints", i, "voltageV"],
          message: "open-circuit voltage must not fall as the state of charge rises (not monotonic)",
        });
    });
  });

export const batteryChargeInput = z
  .strictObject({
    source: battery,
    target: battery,
    stages: z.array(stageInput).min(1).max(10).meta({ description: "the stages to compare side by side" }),
    currentLimitA: quantity("A", "charge current limit (absent: none)", { gt: 0, le: 1e4 }).optional(),
    ambientC: temperatureC("ambient temperature"),
    stop: z
      .strictObject({
        targetSoc: ratio("stop when the target reaches this state of charge (default 1)", { gt: 0, le: 1 }).optional(),
        minCurrentA: quantity(
          "A",
          "stop when the charge current falls below this taper (default 1e-3 of the target's capacity per hour)",
          { gt: 0, le: 1e4 },
        ).optional(),
        sourceMinSoc: ratio("stop when the source falls to this state of charge (default 0)", {
          ge: 0,
          lt: 1,
        }).optional(),
        maxTimeS: quantity("s", "stop after this time (default 7 days)", { gt: 0, le: 1e8 }).optional(),
      })
      .optional(),
    relativeTolerance: ratio("relative tolerance of the adaptive ODE step (default 1e-7)", {
      ge: 1e-12,
      le: 1e-2,
    }).optional(),
    ruleSet: ruleSetRef.optional().meta({
      description:
        "when given, the result carries this rule set's verdicts (docs/metrics.md lists what this analysis provides)",
    }),
    ruleMetrics: metricRecord.optional().meta({
      description:
        "requirement metrics for the rules that this analysis does not compute (parallelSources, reverseVMaxV, reverseCurrentBudgetA, ...)",
    }),
  })
  .meta({
    description: "battery-to-battery charging through each stage: charge time, losses, final states, reverse drain",
  });
export type BatteryChargeInput = z.input<typeof batteryChargeInput>;

/** Metrics for rules: the target can drain the source; how full the target gets. */
export const chargeMetrics = z.object({
  targetCanDrainSource: z.boolean(),
  backCurrentA: z.number(),
  finalTargetSoc: z.number().optional(),
  chargeTimeS: z.number().optional(),
  stageLossJ: z.number().optional(),
  peakStageTjC: z.number().optional(),
  overTemperature: z.boolean().optional(),
});

const reverse = z.object({
  sourceOcvV: z.number(),
  targetOcvV: z.number(),
  backCurrentA: z.number(),
  blocks: z.boolean(),
  mode: z.string(),
});
const result = z.discriminatedUnion("outcome", [
  z.object({
    outcome: z.literal("charged"),
    stoppedBy: z.enum(["target-soc", "taper-current", "source-soc-floor", "time-limit"]),
    timeS: z.number(),
    chargeMovedC: z.number(),
    finalSourceSoc: z.number(),
    finalTargetSoc: z.number(),
    finalCurrentA: z.number(),
    energy: z.object({
      sourceOutJ: z.number(),
      targetInJ: z.number(),
      stageLossJ: z.number(),
      resistanceLossJ: z.number(),
      limiterLossJ: z.number(),
      balanceResidual: z.number(),
    }),
    errorBound: z.object({ chargeC: z.number(), targetSoc: z.number(), timeS: z.number(), stageLossJ: z.number() }),
    peakStageTjC: z.number(),
    stageTjMaxC: z.number(),
    overTemperature: z.boolean().meta({ description: "the stage's junction passes its limit during the charge" }),
    steps: z.number(),
    reverse,
  }),
  z.object({ outcome: z.literal("no-charge"), reason: z.string(), initialCurrentA: z.number(), reverse }),
  z.object({ outcome: z.literal("integration-failed"), reason: z.string() }),
  z.object({ outcome: z.literal("thermal-runaway"), reason: z.string() }),
]);

export const batteryChargeOutput = z.object({
  ...provenance,
  assumptions: z.array(z.string()),
  stages: z.array(
    z.object({
      stage: z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() }),
      result,
      metrics: chargeMetrics,
      rules: ruleSetResultSchema
        .optional()
        .meta({ description: "verdicts of the named rule set on this stage (present when ruleSet was given)" }),
    }),
  ),
});
export type BatteryChargeOutput = z.infer<typeof batteryChargeOutput>;
