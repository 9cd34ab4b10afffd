import { z } from "zod";
import { load } from "./load.js";
import { metricRecord } from "./rule-set.js";
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
    clamp: z
      .strictObject({
        levelV: quantity("V", "the clamp's level: the input is held no lower than it (minus a TVS's breakdown)", {
          ge: -10_000,
          le: 10_000,
        }),
        dynamicResistanceOhm: quantity("ohm", "the clamp's dynamic resistance (default 0: a constant level)", {
          ge: 0,
          le: 1e3,
        }).optional(),
      })
      .optional()
      .meta({
        description:
          "a clamp at the input node: the decaying source is behind the loop's resistance, and while it would take the input below levelV the clamp holds the input there (its level plus its dynamic resistance's drop); it lets go where the source alone carries the loop current, and the input then follows the source (a held-then-decaying input)",
      }),
  })
  .meta({
    description:
      "the input after the event decays exponentially from startV to inputAfterV with time constant τ (a negative pulse's tail, a source's output capacitance discharging) instead of stepping to inputAfterV (absent: the input steps to inputAfterV); with clamp, startV is the source's unclamped start",
  });

/**
 * A supply-gated FET's gate resistor (a P-FET's to ground, a low-side N-FET's from the positive
 * rail): how fast its |Vgs| follows the falling output.
 */
export const pfetGateLag = z
  .strictObject({
    resistanceOhm: quantity(
      "ohm",
      "gate resistor (a P-FET's gate to ground, a low-side N-FET's gate from the positive rail)",
      { gt: 0, le: 1e9 },
    ),
    gateChargeC: quantity("C", "the MOSFET's total gate charge Qg", { gt: 0, le: 1e-3 }),
    atGateSourceV: quantity("V", "the gate-source voltage Qg is given at (magnitude)", { gt: 0, le: 100 }),
  })
  .meta({
    description:
      "a P-FET's or low-side N-FET's gate resistor and gate charge: its |Vgs| lags the output by Rg·Qg/Vgs, keeping the channel on (and the output following a negative input below 0 V) until it falls below threshold (default: no lag)",
  });

export const loadReverseLimitField = quantity(
  "V",
  "the largest reverse voltage the load tolerates at its input (magnitude; rule load-reverse-voltage)",
  { ge: 0, le: 10_000 },
).optional();

/** One refusal of a falling input: the path below the event's own fields, and the message. */
export interface InputFallIssue {
  readonly path: readonly string[];
  readonly message: string;
}

/**
 * The one check that the input falls at t = 0 (turnOff, holdUp, the review's turnOff event): the level it
 * steps to (`inputAfterV`) and a decay's start (`inputDecay.startV`) must lie below the output voltage before
 * the event. `outputName` is the field the caller gave that voltage in (or where its default came from).
 */
export function inputFallIssues(
  v: {
    readonly outputV: number;
    readonly inputAfterV: number;
    readonly inputDecay?:
      | { readonly startV: number; readonly clamp?: { readonly levelV: number } | undefined }
      | undefined;
  },
  outputName = "outputV",
): InputFallIssue[] {
  const issues: InputFallIssue[] = [];
  if (!(v.inputAfterV < v.outputV))
    issues.push({
      path: ["inputAfterV"],
      message: `must be below the output voltage before the event, ${outputName} (${v.outputV} V): the input falls at t = 0`,
    });
  if (v.inputDecay !== undefined && !(v.inputDecay.startV < v.outputV))
    issues.push({
      path: ["inputDecay", "startV"],
      message: `must be below the output voltage before the event, ${outputName} (${v.outputV} V): the input falls at t = 0 (give the level it jumps to, then decays from)`,
    });
  if (v.inputDecay?.clamp !== undefined && !(v.inputDecay.clamp.levelV < v.outputV))
    issues.push({
      path: ["inputDecay", "clamp", "levelV"],
      message: `must be below the output voltage before the event, ${outputName} (${v.outputV} V): the clamp holds a falling input (give its level, minus a TVS's breakdown)`,
    });
  return issues;
}

/** `inputFallIssues` as issues of a zod refinement, under `at`. */
export function refineInputFalls(
  v: Parameters<typeof inputFallIssues>[0],
  ctx: z.RefinementCtx,
  at: readonly string[] = [],
  outputName = "outputV",
): void {
  for (const issue of inputFallIssues(v, outputName))
    ctx.addIssue({ code: "custom", path: [...at, ...issue.path], message: issue.message });
}

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
  .superRefine((v, ctx) => refineInputFalls(v, ctx))
  .meta({ description: "reverse current when the input falls: peak current, charge lost, turn-off energy" });
export type TurnOffInput = z.input<typeof turnOffInput>;

export {
  type TurnOffEventOutput,
  type TurnOffOutput,
  turnOffEventOutput,
  turnOffMetrics,
  turnOffOutput,
  turnOffWaveformSchema,
} from "./turn-off-output.js";
