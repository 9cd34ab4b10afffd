import { z } from "zod";
import { turnOffEventOutput, turnOffTiming } from "./turn-off.js";
import { LIMITS, limitMessage } from "./limits.js";
import { provenance } from "./outcome.js";
import { ruleSetResultSchema } from "./rule-set.js";
import { quantity, temperatureC } from "./quantity.js";
import { requirement, startProfilePointCount } from "./requirement.js";
import { stageInput } from "./stage.js";
import { thermalPath } from "./thermal.js";
import { zthCurveFields } from "./fit.js";

/** What a Foster or Cauer network spans, and the heat capacity of the rest of the path when it spans junction to case. */
const networkScope = {
  scope: z.enum(["junction-ambient", "junction-case"]).optional().meta({
    description:
      "what the network spans (default junction-ambient: its ΣR must be the stage's thermal path within 5 %); junction-case: a datasheet Zth(j-c) network, cascaded with the rest of the path as one node of caseToAmbientHeatCapacityJPerK",
  }),
  caseToAmbientHeatCapacityJPerK: quantity(
    "J/K",
    "heat capacity of the case-to-ambient path (board copper, heatsink), for a junction-case network",
    { gt: 0, le: 1e6 },
  ).optional(),
};

function needsCaseCapacity(
  t: { scope?: string | undefined; caseToAmbientHeatCapacityJPerK?: number | undefined },
  ctx: z.RefinementCtx,
): void {
  if (t.scope === "junction-case" && t.caseToAmbientHeatCapacityJPerK === undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["caseToAmbientHeatCapacityJPerK"],
      message: "a junction-case network needs the heat capacity of the rest of the path (board copper, heatsink), J/K",
    });
  }
  if (t.scope !== "junction-case" && t.caseToAmbientHeatCapacityJPerK !== undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["caseToAmbientHeatCapacityJPerK"],
      message: 'only a network with scope "junction-case" takes a case-to-ambient heat capacity',
    });
  }
}

export const transientThermal = z
  .discriminatedUnion("kind", [
    z
      .strictObject({
        kind: z.literal("foster"),
        terms: z
          .array(
            z.strictObject({
              rKPerW: quantity("K/W", "thermal resistance of the term", { gt: 0, le: 10_000 }),
              tauS: quantity("s", "time constant τ = R·C", { gt: 0, le: 1e6 }),
            }),
          )
          .min(1)
          .max(12),
        ...networkScope,
      })
      .superRefine(needsCaseCapacity),
    z
      .strictObject({
        kind: z.literal("cauer"),
        stages: z
          .array(
            z.strictObject({
              rKPerW: quantity("K/W", "resistance from this node to the next (the last: to ambient, or to the case)", {
                gt: 0,
                le: 10_000,
              }),
              cJPerK: quantity("J/K", "heat capacity from this node to ambient", { gt: 0, le: 1e6 }),
            }),
          )
          .min(1)
          .max(12)
          .meta({ description: "the ladder's stages, junction first" }),
        ...networkScope,
      })
      .superRefine(needsCaseCapacity)
      .meta({
        description:
          "a Cauer (ladder) network: physical nodes, so a junction-case ladder is cascaded with the case-to-ambient path exactly",
      }),
    z.strictObject({
      kind: z.literal("single-pole"),
      heatCapacityJPerK: quantity("J/K", "heat capacity of the junction-to-ambient path", { gt: 0, le: 1e6 }),
    }),
    z.strictObject({ kind: z.literal("zth-points"), ...zthCurveFields }).meta({
      description:
        "single-pulse junction-to-ambient Zth(t) points, fitted to a Foster network (steadyKPerW default: the stage's thermal path)",
    }),
  ])
  .meta({
    description:
      "transient thermal model for start-up profiles: a Foster or Cauer network (junction-ambient, or junction-case cascaded with the board), one pole from RthJA and a heat capacity, or Zth(t) points fitted to a Foster network (absent: quasi-static steady state, an upper bound)",
  });

export const candidate = z.strictObject({
  label: z.string().min(1).max(200).optional(),
  stage: stageInput,
  thermal: thermalPath.optional().meta({ description: "overrides the stage's thermal path on this board" }),
  datasheetMax: z
    .strictObject({
      rdsOnFactor: z.number().gte(1).lte(5).meta({ description: "datasheet maximum ÷ typical Rds(on)", unit: "1" }),
      forwardVoltageFactor: z
        .number()
        .gte(1)
        .lte(5)
        .meta({ description: "datasheet maximum ÷ typical forward voltage", unit: "1" }),
      startV: quantity(
        "V",
        "datasheet maximum start voltage of the controller or integrated switch (the start checks and the datasheet-maximum corners use it)",
        { ge: 0, le: 10_000 },
      ).optional(),
      thresholdV: quantity(
        "V",
        "datasheet maximum gate threshold Vth(max) of the MOSFET, at 25 °C (the start checks and the datasheet-maximum corners use it)",
        { ge: 0, le: 100 },
      ).optional(),
      reverseThresholdV: quantity(
        "V",
        "datasheet maximum reverse-current threshold of the controller (the review's turn-off event uses it)",
        { ge: 0, le: 10 },
      ).optional(),
      turnOffDelayS: quantity(
        "s",
        "datasheet maximum turn-off delay of the controller (the review's turn-off event uses it)",
        { ge: 0, le: 1 },
      ).optional(),
    })
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
              "standard deviation: relative for rdsOn, forwardVoltage, rth, load (≤ 0.2); V or K for supplyV, ambientC, startV (a controller's or switch's start voltage), thresholdV (the MOSFET's Vth)",
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
        "also return load and ambient sweeps through the worst corner, for charts (default false; reports ask for them)",
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

const pointFields = {
  outcome: z.string(),
  mode: z.string().optional(),
  currentA: z.number().optional(),
  dropV: z.number().optional(),
  lossW: z.number().optional(),
  tjC: z.number().optional(),
  loadV: z.number().optional(),
  reason: z.string().optional(),
};

export const cornerConditions = z.object({
  supply: z.enum(["min", "nominal", "max"]),
  supplyV: z.number(),
  ambient: z.enum(["min", "max"]),
  ambientC: z.number(),
  loadScale: z.number(),
  tolerance: z.enum(["typical", "datasheet-max"]),
});

export const cornerRow = z.object({ conditions: cornerConditions, ...pointFields });

export const reviewCurves = z
  .object({
    conditions: cornerConditions.extend({
      basis: z
        .enum(["worst-tj-corner", "lowest-supply-hot-full-load"])
        .meta({ description: "which corner the curves pass through" }),
    }),
    load: z
      .array(z.object({ loadScale: z.number(), ...pointFields }))
      .meta({ description: "load level swept at the conditions' supply, ambient and tolerance" }),
    ambient: z.array(z.object({ ambientC: z.number(), ...pointFields })).meta({
      description: "ambient swept over the requirement's range at the conditions' supply, load and tolerance",
    }),
  })
  .meta({
    description:
      "drop, loss and Tj against load level and ambient, through the worst-Tj corner (same solve as the corners), for plots",
  });

const driveAt = z.object({
  inputV: z.number(),
  startMarginV: z.number().optional(),
  gateSourceV: z.number().optional(),
  gateDriveMarginV: z.number().optional(),
});
const profileSample = z.object({
  timeS: z.number(),
  supplyV: z.number(),
  mode: z.string(),
  loadV: z.number(),
  lossW: z.number(),
  tjC: z.number(),
});
export const reviewStartUp = z
  .object({
    atMinSupply: driveAt,
    atProfileMin: driveAt
      .optional()
      .meta({ description: "the same at the start-up profile's lowest point (with a profile)" }),
    profiles: z
      .array(
        z.object({
          ambientC: z.number(),
          result: z.object({
            samples: z.array(profileSample).readonly(),
            minLoadV: z.number(),
            maxTjC: z.number(),
            bodyDiodeTimeS: z.number(),
            dropoutTimeS: z.number(),
            thermalModel: z.string(),
          }),
        }),
      )
      .readonly(),
  })
  .meta({ description: "drive at the lowest supply; the start-up profile samples per ambient" });

const worstOf = z.object({ value: z.number(), corner: z.number().int() });

export const candidateResult = z.object({
  index: z.number().int(),
  label: z.string(),
  stage: z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() }),
  rank: z.number().int(),
  verdict: z.string(),
  rankReason: z.string(),
  worst: z.object({
    tjC: worstOf.optional(),
    lossW: worstOf.optional(),
    dropV: worstOf.optional(),
    loadMinV: worstOf.optional(),
    unsolvedCorners: z.array(z.number().int()),
  }),
  corners: z.array(cornerRow),
  startUp: reviewStartUp,
  curves: reviewCurves.optional(),
  turnOff: z
    .object({
      tjC: z.number().meta({ description: "junction temperature at the event" }),
      tjSource: z.enum(["given", "worst-corner", "highest-ambient"]),
      avalancheRatingJ: z
        .number()
        .optional()
        .meta({ description: "the part's single-pulse avalanche rating at 25 °C starting Tj" }),
      event: turnOffEventOutput,
    })
    .optional()
    .meta({
      description:
        "the requirement's turn-off event for this candidate (as the turnOff procedure computes it; the waveform when curves were asked for)",
    }),
  reverse: z.unknown().meta({
    description: "steady reverse polarity: blocking element, voltage vs rating, leakage, junction temperature",
  }),
  transients: z.unknown().meta({ description: "per pulse: peak, element stresses, clamp requirement" }),
  thermalSizing: z.unknown(),
  energy: z.unknown().optional(),
  standby: z.unknown(),
  metrics: z.record(z.string(), z.union([z.number(), z.boolean()])),
  rules: ruleSetResultSchema,
  costTotal: z.number().optional(),
});

const distribution = z
  .object({
    mean: z.number(),
    std: z.number(),
    p1: z.number(),
    p5: z.number(),
    p50: z.number(),
    p95: z.number(),
    p99: z.number(),
    min: z.number(),
    max: z.number(),
  })
  .meta({
    description: "mean, standard deviation and nearest-rank percentiles over the samples with an operating point",
  });

export const monteCarloResult = z.object({
  candidate: z.number().int(),
  samples: z.number().int(),
  seed: z.number().int(),
  supplyV: z.number(),
  ambientC: z.number(),
  shareWithoutOperatingPoint: z
    .number()
    .meta({ description: "share of samples with no operating point (runaway, collapse, stage off)" }),
  tjC: distribution.optional(),
  lossW: distribution.optional(),
  dropV: distribution.optional(),
  loadV: distribution.optional(),
  shareFailingByRule: z
    .record(z.string(), z.number())
    .meta({ description: "rule id → share of samples on which it fails" }),
  shareWarningByRule: z.record(z.string(), z.number()),
});

export const reviewOutput = z.object({
  ...provenance,
  requirement: z.object({
    supplyClass: z.string(),
    supplyMinV: z.number(),
    supplyNominalV: z.number(),
    supplyMaxV: z.number(),
    reverseV: z.number(),
    transients: z.array(z.string()),
    sources: z.array(z.string()),
  }),
  ranking: z.array(
    z.object({
      rank: z.number().int(),
      index: z.number().int(),
      label: z.string(),
      verdict: z.string(),
      reason: z.string(),
    }),
  ),
  candidates: z.array(candidateResult),
  monteCarlo: monteCarloResult.optional(),
  assumptions: z.array(z.string()),
});
export type ReviewOutput = z.infer<typeof reviewOutput>;
