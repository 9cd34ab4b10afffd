import { z } from "zod";
import { provenance } from "./outcome.js";
import { ruleSetResultSchema } from "./rule-set.js";
import { turnOffEventOutput } from "./turn-off.js";
import { reviewStartUp } from "./review-start-up.js";

export { reviewStartUp };

/** What a design review answers: per candidate its corners, worst cases, start-up, Monte Carlo and verdicts. */

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

export const cornerRow = z.object({
  conditions: cornerConditions,
  ...pointFields,
  hotterAtLimit: z
    .object({ currentLimitA: z.number(), ...pointFields })
    .optional()
    .meta({
      description:
        "an integrated switch given a datasheet minimum current limit: the corner's point is solved at that minimum (the load's supply); this is the same corner at the typical limit where it heats the die more (the limiting loss (Vin − Ilim·R)·Ilim is not monotonic in Ilim): the corner's Tj and loss for the worst case and the rules",
    }),
});

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
    cornersWithoutOperatingPoint: z
      .array(
        z.object({
          corner: z.number().int().meta({ description: "index into corners" }),
          name: z.string().meta({ description: "the corner's supply, ambient, load and tolerance in words" }),
          outcome: z.string(),
          reason: z.string(),
        }),
      )
      .meta({
        description:
          "each corner without an operating point and why (the rule corner-solves fails on them; the corner rules cannot be read there)",
      }),
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
      train: z
        .discriminatedUnion("outcome", [
          z.object({
            outcome: z.literal("computed"),
            periodS: z.number(),
            count: z.number(),
            equivalentWidthS: z.number().meta({ description: "the clamp phase's energy at its peak power, E/Ppk" }),
            singlePulseTjC: z.number(),
            trainTjC: z.number().meta({ description: "the blocking element's junction at the end of the last event" }),
            steadyPeriodicTjC: z.number(),
          }),
          z.object({ outcome: z.literal("overlapping"), reason: z.string() }),
        ])
        .optional()
        .meta({
          description:
            "with turnOff.repetition and a Foster transientThermal: the blocking element's junction over the train of events",
        }),
    })
    .optional()
    .meta({
      description:
        "the requirement's turn-off event for this candidate (as the turnOff procedure computes it; the waveform when curves were asked for)",
    }),
  pulseBackConduction: z
    .array(
      z.discriminatedUnion("outcome", [
        z.object({
          pulseId: z.string(),
          outcome: z.literal("assessed"),
          inputPeakV: z.number().meta({
            description:
              "the input at the event's start: the Thevenin source's start (the pulse with the battery where it rides on the supply), or, where the design's input clamp holds it, the input node at the clamp's level (its breakdown plus the dynamic resistance's drop at the current it carries)",
          }),
          inputAfterV: z
            .number()
            .meta({ description: "the level the input decays back to (the Thevenin source's constant part)" }),
          tauS: z.number(),
          loopResistanceOhm: z.number().meta({
            description:
              "the generator's internal resistance Ri, in parallel with the battery's where the pulse rides on the supply (wiring not added)",
          }),
          batteryResistanceOhm: z.number().optional().meta({
            description:
              "a pulse riding on the supply: the battery's resistance (requirement.sourceResistanceOhm; 0 holds the input at the nominal supply)",
          }),
          eventOutcome: z.string().meta({ description: "the turn-off event's outcome for this input" }),
          channel: z.enum(["turned-off", "conducts-throughout"]).meta({
            description:
              "turned-off: the lagged |Vgs| fell below threshold; conducts-throughout: the output held it above (the battery holds the output), the channel conducting backwards into the pulse, its reverse peak the figure",
          }),
          channelOffS: z.number().optional().meta({ description: "when the FET's gate turned its channel off" }),
          outputAtLetGoV: z.number().optional().meta({
            description:
              "once the channel let go and the loop current stopped: the output its body diode holds against the input (the element's transient stress adds it to the input's peak)",
          }),
          peakReverseCurrentA: z.number(),
          peakReverseIsLowerBound: z.literal(true).optional().meta({
            description: "the current still rising at the end of the simulated span: the peak is a lower bound",
          }),
          chargeLostC: z
            .number()
            .meta({ description: "charge the output capacitor lost until the loop current stopped" }),
          outputMinV: z
            .number()
            .meta({ description: "the output's lowest voltage: below 0 the load sees reverse voltage" }),
          clampHold: z
            .object({
              levelV: z.number().meta({ description: "the clamp's level at the input (minus its breakdown voltage)" }),
              dynamicOhm: z.number().meta({ description: "the clamp's dynamic resistance (0: a constant level)" }),
              releaseS: z.number().optional().meta({
                description:
                  "when the clamp let go, the generator alone carrying the loop current, and the input began to follow the source's decay (absent: it held over the whole searched span)",
              }),
            })
            .optional()
            .meta({
              description:
                "the design's input clamp held the input at its level at the start, while the unclamped source was beyond it; the loop's state carried on into the source's decay",
            }),
        }),
        z.object({
          pulseId: z.string(),
          outcome: z.literal("no-response"),
          reason: z.string(),
          driveV: z.number().optional().meta({
            description:
              "clamp-below-drive: the output-to-input voltage across the blocking element when the channel let go, beyond its breakdown (the body diode's stress reads it)",
          }),
        }),
        z.object({
          pulseId: z.string(),
          outcome: z.literal("not-assessed"),
          reason: z.string().meta({ description: "why, and what to add to the request (requirement.turnOff)" }),
        }),
      ]),
    )
    .optional()
    .meta({
      description:
        "a P-FET or low-side N-FET candidate (its gate-source sees the output): each negative pulse as the turn-off event's input, with the requirement's turnOff (without it: not-assessed, with the reason) (a decaying level: the generator alone where the supply is disconnected, the generator and the battery as one Thevenin source where the pulse rides on the supply), the channel conducting backwards until its gate lets go",
    }),
  reverse: z.unknown().meta({
    description: "steady reverse polarity: blocking element, voltage vs rating, leakage, junction temperature",
  }),
  transients: z.unknown().meta({ description: "per pulse: peak, element stresses, clamp requirement" }),
  inrush: z.unknown().optional().meta({
    description:
      "with the requirement's inrush: the drive (uncontrolled, slew, current-limit), the charge time, peak current and power, the stage's energy, its Tj peak and the outcome (charged, thermal-shutdown, does-not-charge)",
  }),
  loadOvervoltage: z.unknown().optional().meta({
    description:
      "what reaches the load per positive pulse (an overvoltage cut-off opens above its threshold after its response time) and the highest of them with the steady overvoltages",
  }),
  thermalShutdownCycle: z.unknown().optional().meta({
    description:
      "an integrated switch with afterThermalShutdown auto-retry whose hottest steady corner reaches its shutdown: the corner, and the cycle between shutdown and shutdown − hysteresis (outcome cycles: the on loss, the duty the load gets, the average dissipation, the heating, cooling and period times through the Foster network; or stays-off, does-not-trip, not-converged with a reason). The load is interrupted either way: switch-thermal-shutdown-in-service fails",
  }),
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
