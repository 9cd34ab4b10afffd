import { z } from "zod";
import { load } from "./load.js";
import { provenance } from "./outcome.js";
import { metricRecord, ruleSetResultSchema } from "./rule-set.js";
import { ruleSetRef } from "./rules.js";
import { quantity, temperatureC } from "./quantity.js";
import { stageInput } from "./stage.js";

/** The loop from the input to the stage: source and wiring resistance (without the stage) and inductance. */
export const reverseLoop = z
  .strictObject({
    resistanceOhm: quantity("ohm", "source and wiring resistance of the loop, without the stage", { ge: 0, le: 1e6 }),
    inductanceH: quantity("H", "loop inductance (wiring, connector, input filter)", { gt: 0, le: 10 }),
  })
  .meta({ description: "the input loop through which the reverse current flows" });

export const holdUpCapacitor = z
  .strictObject({
    capacitanceF: quantity("F", "output (hold-up) capacitance", { gt: 0, le: 1e3 }),
    esrOhm: quantity("ohm", "its equivalent series resistance", { ge: 0, le: 1e3 }),
  })
  .meta({ description: "the capacitor that holds the output" });

export const turnOffTiming = z
  .strictObject({
    reverseThresholdV: quantity("V", "reverse drain-source voltage at which the controller trips (magnitude)", {
      ge: 0,
      le: 10,
    }),
    turnOffDelayS: quantity("s", "delay from the trip to the start of the gate discharge", { ge: 0, le: 1 }),
    gateChargeC: quantity("C", "gate charge to remove at turn-off", { gt: 0, le: 1 }).optional(),
    gateSinkCurrentA: quantity("A", "the driver's gate sink current", { gt: 0, le: 100 }).optional(),
  })
  .meta({
    description:
      "reverse-current turn-off of a controller; default: the stage controller's reverseThresholdV and turnOffDelayS",
  });

export const repetitiveEvent = z.boolean().optional().meta({
  description:
    "the event repeats in service (each switch-off, each pulse of a train), not a one-off fault: the absorbed energy is then also held to the MOSFET's repetitive avalanche rating EAR (default false)",
});

/** The fields the turn-off event and the hold-up of a falling input share. */
/** A diode stage's Qrr and the voltage the inductive energy is clamped at: fields of every turn-off event. */
export const reverseRecoveryChargeField = quantity(
  "C",
  "a diode stage's reverse-recovery charge Qrr (default 0: ideal)",
  {
    ge: 0,
    le: 1,
  },
).optional();
export const inductiveClampField = quantity(
  "V",
  "voltage the blocking element clamps the inductive energy at (default: its rated voltage)",
  {
    gt: 0,
    le: 10_000,
  },
).optional();

/** The input from t = 0 on: a short (0 V), a lower voltage, or a negative one (a reversed pulse's level). */
export const inputAfterField = quantity(
  "V",
  "input voltage from t = 0 on: 0 for a short, the lower voltage it steps to, or a negative one (a negative pulse held at its level)",
  { ge: -10_000, le: 10_000 },
);

/** An input that decays after the event instead of stepping: from startV at t = 0+ to inputAfterV as e^(−t/τ). */
export const inputDecayField = z
  .strictObject({
    startV: quantity("V", "input voltage at t = 0+, from which it decays to inputAfterV (below outputV)", {
      ge: -10_000,
      le: 10_000,
    }),
    timeConstantS: quantity("s", "time constant τ of the exponential decay", { gt: 0, le: 1e3 }),
  })
  .meta({
    description:
      "the input after the event decays exponentially from startV to inputAfterV with time constant τ (a negative pulse's tail, a source's output capacitance discharging) instead of stepping to inputAfterV (absent: the input steps to inputAfterV)",
  });

/** A P-FET's gate tied to ground through a resistor: how fast its |Vgs| follows the falling output. */
export const pfetGateLag = z
  .strictObject({
    resistanceOhm: quantity("ohm", "gate-to-ground resistance", { gt: 0, le: 1e9 }),
    gateChargeC: quantity("C", "the MOSFET's total gate charge Qg", { gt: 0, le: 1e-3 }),
    atGateSourceV: quantity("V", "the gate-source voltage Qg is given at (magnitude)", { gt: 0, le: 100 }),
  })
  .meta({
    description:
      "a P-FET's gate resistor and gate charge: its |Vgs| lags the output by Rg·Qg/Vgs, keeping the channel on (and the output following a negative input below 0 V) until it falls below threshold (default: no lag)",
  });

export const loadReverseLimitField = quantity(
  "V",
  "the largest reverse voltage the load tolerates at its input (magnitude; rule load-reverse-voltage)",
  { ge: 0, le: 10_000 },
).optional();

export const fallingInputFields = {
  stage: stageInput,
  outputV: quantity("V", "output voltage before the event (steady state)", { gt: 0, le: 10_000 }),
  inputAfterV: inputAfterField,
  inputDecay: inputDecayField.optional(),
  gateLag: pfetGateLag.optional(),
  loop: reverseLoop,
  capacitor: holdUpCapacitor,
  load,
  loadMinV: quantity("V", "the load's minimum operating voltage (default: a constant-power load's minVoltageV)", {
    ge: 0,
    le: 10_000,
  }).optional(),
  tjC: temperatureC("junction temperature of the stage at the event"),
  turnOff: turnOffTiming.optional(),
  reverseRecoveryChargeC: reverseRecoveryChargeField,
  clampV: inductiveClampField,
};

export const turnOffInput = z
  .strictObject({
    ...fallingInputFields,
    avalancheRatingJ: quantity(
      "J",
      "single-pulse avalanche energy rating of the blocking element at 25 °C starting Tj (default: the part's avalancheEnergyJ)",
      { gt: 0, le: 1e6 },
    ).optional(),
    repetitive: repetitiveEvent,
    loadReverseLimitV: loadReverseLimitField,
    ruleSet: ruleSetRef.optional().meta({
      description:
        "when given, the result carries this rule set's verdicts (docs/metrics.md lists what this analysis provides)",
    }),
    ruleMetrics: metricRecord.optional().meta({
      description:
        "requirement metrics for the rules that this analysis does not compute (parallelSources, reverseVMaxV, reverseCurrentBudgetA, ...)",
    }),
    waveform: z.boolean().optional().meta({
      description:
        "also return the event as time samples (loop current, output and capacitor voltage), for charts (default false)",
    }),
  })
  .superRefine((v, ctx) => {
    if (!(v.inputAfterV < v.outputV))
      ctx.addIssue({
        code: "custom",
        path: ["inputAfterV"],
        message: "must be below outputV: the input falls at t = 0",
      });
    if (v.inputDecay !== undefined && !(v.inputDecay.startV < v.outputV))
      ctx.addIssue({
        code: "custom",
        path: ["inputDecay", "startV"],
        message: "must be below outputV: the input falls at t = 0 (give the level it jumps to, then decays from)",
      });
  })
  .meta({ description: "reverse current when the input falls: peak current, charge lost, turn-off energy" });
export type TurnOffInput = z.input<typeof turnOffInput>;

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
