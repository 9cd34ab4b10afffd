import { z } from "zod";
import { datasheetMax } from "./datasheet-max.js";
import { turnOffTiming } from "./turn-off.js";
import { LIMITS, limitMessage } from "./limits.js";
import { quantity, temperatureC } from "./quantity.js";
import { requirement, startProfilePointCount } from "./requirement.js";
import { stageInput } from "./stage.js";
import { thermalPath } from "./thermal.js";
import { transientThermal } from "./transient-thermal.js";

export { transientThermal } from "./transient-thermal.js";
export * from "./review-output.js";

export const candidate = z.strictObject({
  label: z.string().min(1).max(200).optional(),
  stage: stageInput,
  thermal: thermalPath.optional().meta({ description: "overrides the stage's thermal path on this board" }),
  datasheetMax: datasheetMax
    .optional()
    .meta({ description: "the datasheet-maximum tolerance corner (absent: typical values only)" }),
  transientThermal: transientThermal.optional(),
  heatsinkCost: z
    .number()
    .gte(0)
    .lte(1e6)
    .optional()
    .meta({ description: "cost of a heatsink if one is needed, for ranking", unit: "currency" }),
  turnOffTiming: turnOffTiming.optional().meta({
    description:
      "this candidate's reverse-current turn-off timing for the requirement's turnOff event (default: requirement.turnOff.timing, else the stage controller's own)",
  }),
});

const mcParameter = z.enum(["rdsOn", "forwardVoltage", "rth", "supplyV", "ambientC", "load", "startV", "thresholdV"]);
export const monteCarloSpec = z.strictObject({
  samples: z
    .number()
    .int()
    .min(1)
    .max(LIMITS.maxMonteCarloSamples, { error: limitMessage("maxMonteCarloSamples", "Monte Carlo samples") }),
  seed: z
    .number()
    .int()
    .min(0)
    .max(2 ** 32 - 1),
  candidate: z
    .number()
    .int()
    .min(0)
    .max(63)
    .optional()
    .meta({ description: "index of the candidate to sample (default 0)" }),
  supplyV: quantity("V", "supply for the samples (default: lowest supply)", { gt: 0, le: 10_000 }).optional(),
  ambientC: temperatureC("ambient for the samples (default: highest ambient)").optional(),
  tolerances: z
    .array(
      z.discriminatedUnion("distribution", [
        z.strictObject({
          parameter: mcParameter,
          distribution: z.literal("normal"),
          sigma: z.number().gte(0).lte(1000).meta({
            description:
              "standard deviation: relative for rdsOn, forwardVoltage, rth, load (≤ 0.2); V or K for supplyV, ambientC, startV (a controller's or switch's start voltage), thresholdV (the MOSFET's Vth; where the candidate's datasheetMax gives thresholdMinV or thresholdV, Vth is drawn uniform over that range instead)",
          }),
        }),
        z.strictObject({
          parameter: mcParameter,
          distribution: z.literal("uniform"),
          halfWidth: z.number().gte(0).lte(1000).meta({ description: "± half width: relative (≤ 0.9) or V / K" }),
        }),
      ]),
    )
    .min(1)
    .max(16),
});

export const reviewInput = z
  .strictObject({
    requirement,
    candidates: z
      .array(candidate)
      .min(1)
      .max(LIMITS.maxCandidates, { error: limitMessage("maxCandidates", "candidates in one review") }),
    ruleSet: z.string().min(1).max(100).optional().meta({ description: "id of a rule set (default: default)" }),
    monteCarlo: monteCarloSpec.optional(),
    curves: z.boolean().optional().meta({
      description:
        "also return the chart data: load and ambient sweeps through the worst corner, every start-up profile sample and the turn-off event's waveform (default false: each profile's figures and its lowest-load and hottest samples only; reports ask for them)",
    }),
  })
  .superRefine((r, ctx) => {
    const work = startProfilePointCount(r.requirement.startProfile) * r.candidates.length;
    if (work > LIMITS.maxProfileWork) {
      ctx.addIssue({
        code: "custom",
        path: ["requirement", "startProfile"],
        message: limitMessage("maxProfileWork", `start-up profile points times candidates is ${work}`),
      });
    }
    const mc = r.monteCarlo;
    if (mc?.candidate !== undefined && mc.candidate >= r.candidates.length)
      ctx.addIssue({ code: "custom", path: ["monteCarlo", "candidate"], message: "no candidate at that index" });
    mc?.tolerances.forEach((t, i) => {
      const relative =
        t.parameter !== "supplyV" &&
        t.parameter !== "ambientC" &&
        t.parameter !== "startV" &&
        t.parameter !== "thresholdV";
      const spread = t.distribution === "normal" ? t.sigma : t.halfWidth;
      const cap = t.distribution === "normal" ? 0.2 : 0.9;
      if (relative && spread > cap)
        ctx.addIssue({
          code: "custom",
          path: ["monteCarlo", "tolerances", i],
          message: `a relative ${t.distribution} spread must be at most ${cap}`,
        });
    });
  })
  .meta({ description: "design review: a requirement and candidate stages" });
export type ReviewInput = z.input<typeof reviewInput>;
