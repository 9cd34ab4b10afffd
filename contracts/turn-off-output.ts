/** The turnOff procedure's answer and the turn-off event inside a review (its input is in turn-off.ts). */
import { z } from "zod";
import { provenance } from "./outcome.js";
import { ruleSetResultSchema } from "./rule-set.js";

const windowState = z.object({
  timeS: z.number(),
  currentA: z.number().meta({ description: "loop current, positive forward" }),
  outputV: z.number(),
  capacitorV: z.number(),
  chargeLostC: z.number(),
  voltageLostV: z.number(),
});
const energies = z.object({
  capacitorLostJ: z.number(),
  inductorLostJ: z.number(),
  sourceDeliveredJ: z.number(),
  loopResistanceJ: z.number(),
  esrJ: z.number(),
  loadJ: z.number(),
  clampJ: z.number(),
  balanceResidual: z.number().meta({ description: "relative energy-balance residual of the phase (a self-check)" }),
});

/** Metrics for rules: reverse-current blocking, absorbed energy against the avalanche rating. */
export const turnOffMetrics = z.object({
  blocksReverseCurrent: z.boolean(),
  peakReverseCurrentA: z.number(),
  turnOffS: z.number().optional(),
  absorbedEnergyJ: z.number().optional(),
  avalancheRatingJ: z.number().optional().meta({ description: "single-pulse avalanche rating at 25 °C starting Tj" }),
  avalancheRatingAtTjJ: z.number().optional().meta({
    description: "the rating derated to the event's starting Tj (what avalanche-energy reads as avalancheEnergyAtTjJ)",
  }),
  avalancheEnergyRatio: z.number().optional().meta({
    description: "absorbed energy / the rating at the event's Tj; above 1 exceeds it (absent when that rating is 0)",
  }),
  outputVoltageLostV: z.number(),
  fallsBelowLoadMinimumS: z.number().optional(),
});

/** The event as samples from the closed form: ~200 per phase, with the reverse peak, the trip and the turn-off instant among them. */
export const turnOffWaveformSchema = z
  .object({
    timeS: z.array(z.number()).readonly().meta({ description: "from the input's fall, s" }),
    currentA: z
      .array(z.number())
      .readonly()
      .meta({ description: "loop current, positive forward (negative: reverse current through the stage)" }),
    outputV: z.array(z.number()).readonly(),
    capacitorV: z.array(z.number()).readonly(),
    clampStartIndex: z.number().int().optional().meta({
      description: "index of the turn-off instant; the clamp phase runs from it on (absent without a clamp phase)",
    }),
    pointsPerPhase: z
      .number()
      .int()
      .meta({ description: "evenly spaced samples per phase (the extrema and event instants come on top)" }),
  })
  .meta({ description: "the turn-off event against time (present when waveform was asked for)" });

const head = {
  ...provenance,
  stage: z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() }),
  assumptions: z.array(z.string()),
  rules: ruleSetResultSchema
    .optional()
    .meta({ description: "verdicts of the named rule set on the event (present when ruleSet was given)" }),
};
const eventFields = {
  loop: z.object({
    regime: z.enum(["under-damped", "critically-damped", "over-damped"]),
    dampingRatio: z.number(),
    naturalRadPerS: z.number(),
    decayPerS: z.number(),
    totalResistanceOhm: z.number(),
    stageResistanceOhm: z.number(),
  }),
  loadMethod: z.string(),
  initialCurrentA: z.number(),
  initialSlopeAPerS: z.number(),
  peakReverseCurrentA: z.number().meta({
    description:
      "largest reverse current of the event (magnitude): up to turn-off for a stage that blocks, else followed past the window until the current turns",
  }),
  peakReverseTimeS: z.number(),
  peakReverseIsLowerBound: z.literal(true).optional().meta({
    description:
      "present when the current was still rising at the end of the searched span: peakReverseCurrentA is only a lower bound (rules read it as unavailable)",
  }),
  end: windowState,
  energies,
  outputMinV: z.number().meta({
    description:
      "the output's lowest voltage over the event (through the clamp phase where there is one): below 0 V the load sees reverse voltage",
  }),
  inputClampHold: z
    .object({
      levelV: z.number(),
      dynamicOhm: z.number(),
      inputAtStartV: z.number().meta({ description: "the input node at t = 0+, held by the clamp" }),
      releaseS: z.number().optional().meta({
        description:
          "when the clamp let go, the source alone carrying the loop current, and the input began to follow the source (absent: it held over the whole searched span)",
      }),
    })
    .optional()
    .meta({ description: "with inputDecay.clamp conducting at the start: how long it held the input at its level" }),
  metrics: turnOffMetrics,
  waveform: turnOffWaveformSchema.optional(),
};

/** The clamp phase after the stage turns off. */
const clampPhaseSchema = z.object({
  clampV: z.number(),
  currentAtTurnOffA: z.number(),
  inductiveEnergyJ: z.number().meta({ description: "½·L·I² at turn-off" }),
  clampedFormulaJ: z.number().meta({ description: "½·L·I²·Vcl/(Vcl − Vs), Vs = output − input at turn-off" }),
  absorbedJ: z.number().meta({ description: "Vcl·∫|i|dt over the clamp phase, exact loop response" }),
  durationS: z.number(),
  avalancheRatingJ: z.number().optional().meta({ description: "single-pulse avalanche rating at 25 °C starting Tj" }),
  avalancheRatingAtTjJ: z.number().optional().meta({
    description: "the rating derated linearly to zero at Tj(max), at the event's starting Tj (no credit below 25 °C)",
  }),
  withinAvalancheRating: z.boolean().optional().meta({ description: "absorbedJ within avalancheRatingAtTjJ" }),
  after: windowState,
  energies,
});

/** The event's outcomes, with the given head fields (the turnOff result's provenance, or none inside a review). */
function eventOutcomes<H extends z.ZodRawShape>(h: H) {
  const common = { ...h, ...eventFields };
  return z.discriminatedUnion("outcome", [
    z.object({
      outcome: z.literal("blocks"),
      ...common,
      turnOffS: z.number(),
      detectS: z.number().optional(),
      clamp: clampPhaseSchema.optional(),
    }),
    z.object({
      outcome: z.literal("does-not-block"),
      ...common,
      reason: z.string(),
      fallsBelowMinS: z.number().optional(),
      settlesAtV: z.number(),
      gateTurnOff: z
        .object({
          channelOffS: z.number().meta({ description: "when the lagged |Vgs| fell below threshold" }),
          gateLagS: z.number().meta({ description: "Rg·Qg/Vgs (0: the gate follows the output at once)" }),
          outputAtOffV: z.number(),
          currentAtOffA: z.number().meta({ description: "loop current at the turn-off (negative: reverse)" }),
          peakReverseCurrentA: z.number().meta({ description: "largest reverse current up to the turn-off" }),
          chargeLostC: z.number().meta({ description: "charge the output capacitor lost until the current stopped" }),
          outputMinV: z.number(),
          end: windowState,
          clamp: clampPhaseSchema.optional(),
        })
        .optional()
        .meta({
          description:
            "a P-FET with its gate at ground: the channel conducts backwards until its gate turns it off, then the body diode blocks (absent: it stays on)",
        }),
    }),
    z.object({ outcome: z.literal("stays-on"), ...common, reason: z.string() }),
    z.object({
      outcome: z.literal("clamp-below-drive"),
      ...h,
      reason: z.string(),
      clampV: z.number(),
      driveV: z.number(),
      currentAtTurnOffA: z.number(),
    }),
    z.object({ outcome: z.literal("invalid-load-line"), ...h, reason: z.string(), path: z.string() }),
    z
      .object({
        outcome: z.literal("unstable-loop"),
        ...h,
        reason: z.string(),
        mode: z
          .enum(["diverges", "oscillation-grows"])
          .meta({ description: "diverges: a real growing mode (R·P/V² ≥ 1); oscillation-grows: negative damping" }),
        dampingRatio: z.number().meta({
          description: "damping ratio of the linearised loop (negative: negative damping; 0 where it diverges)",
        }),
        growthPerS: z.number().meta({ description: "growth rate of the fastest-growing natural mode, 1/s" }),
        loadIncrementalResistanceOhm: z
          .number()
          .meta({ description: "the constant-power load's incremental resistance −V²/P at the pre-event output" }),
      })
      .meta({
        description:
          "the constant-power load's negative incremental resistance makes the linearised loop unstable: no bounded response",
      }),
  ]);
}

export const turnOffOutput = eventOutcomes(head);
export type TurnOffOutput = z.infer<typeof turnOffOutput>;
/** The event inside a design review (no provenance of its own). */
export const turnOffEventOutput = eventOutcomes({});
export type TurnOffEventOutput = z.infer<typeof turnOffEventOutput>;
