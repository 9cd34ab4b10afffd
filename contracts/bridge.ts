import { z } from "zod";
import { load } from "./load.js";
import { provenance } from "./outcome.js";
import { metricRecord, ruleSetResultSchema } from "./rule-set.js";
import { ruleSetRef } from "./rules.js";
import { quantity, temperatureC } from "./quantity.js";
import { stageInput } from "./stage.js";

/** Stage kinds that can sit in a bridge position. */
export const BRIDGE_ELEMENT_KINDS = ["pn-diode", "schottky-diode", "nfet-ideal-diode"] as const;

const element = stageInput.meta({
  description:
    "a bridge element: pn-diode, schottky-diode or nfet-ideal-diode (a MOSFET driven as an ideal diode), inline or a catalog part",
});

/**
 * The four elements of a full bridge: all alike, high side and low side (a mixed bridge), or each
 * position. line1High: line 1 → OUT+; line2High: line 2 → OUT+; line1Low: OUT− → line 1;
 * line2Low: OUT− → line 2.
 */
export const bridgeElementsInput = z
  .union([
    z.strictObject({ all: element }),
    z.strictObject({ high: element, low: element }),
    z.strictObject({ line1High: element, line2High: element, line1Low: element, line2Low: element }),
  ])
  .meta({ description: "bridge elements: { all }, { high, low } or { line1High, line2High, line1Low, line2Low }" });
export type BridgeElementsInput = z.output<typeof bridgeElementsInput>;

export const BRIDGE_POSITIONS = ["line1High", "line2High", "line1Low", "line2Low"] as const;
const position = z.enum(BRIDGE_POSITIONS);

const common = {
  bridge: bridgeElementsInput,
  compareTo: bridgeElementsInput.optional().meta({
    description: "a second bridge (e.g. the diode bridge the active one replaces): the result gives the saving",
  }),
  sourceResistanceOhm: quantity("ohm", "source and wiring resistance (default 0)", { ge: 0, le: 1e6 }).optional(),
  load,
  ambientC: temperatureC("ambient temperature"),
  ruleSet: ruleSetRef
    .optional()
    .meta({ description: "when given, the result carries this rule set's verdicts on the bridge (and on compareTo)" }),
  ruleMetrics: metricRecord.optional().meta({
    description:
      "requirement metrics for the rules that the bridge analysis does not compute (supplyMinV, standbyBudgetA, ...)",
  }),
};

export const bridgeDcInput = z
  .strictObject({
    ...common,
    supplyV: quantity("V", "magnitude of the DC supply; both polarities are analysed", { gt: 0, le: 10_000 }),
  })
  .meta({ description: "full bridge on a DC input of either polarity, electrothermally" });
export type BridgeDcInput = z.input<typeof bridgeDcInput>;

export const bridgeAcInput = z
  .strictObject({
    ...common,
    sourceRmsV: quantity("V", "RMS voltage of the sine source", { gt: 0, le: 10_000 }),
    frequencyHz: quantity("Hz", "source frequency", { gt: 0, le: 1e5 }),
    leakageInductanceH: quantity("H", "source (transformer leakage) inductance (default 0)", {
      ge: 0,
      le: 10,
    }).optional(),
    capacitanceF: quantity("F", "reservoir capacitance", { gt: 0, le: 100 }),
    esrOhm: quantity("ohm", "reservoir capacitor ESR (default 0)", { ge: 0, le: 1e3 }).optional(),
    capacitorRippleRatingA: quantity("A", "rated RMS ripple current of the reservoir capacitor, for the rules", {
      gt: 0,
      le: 1e4,
    }).optional(),
    waveform: z.boolean().optional().meta({
      description:
        "also return one period of the steady state as samples (source and output voltage, each element's current), for charts (default false; the bridge report asks for it)",
    }),
  })
  .meta({
    description: "full bridge on an AC input with a reservoir capacitor: periodic steady state, electrothermally",
  });
export type BridgeAcInput = z.input<typeof bridgeAcInput>;

const head = {
  ...provenance,
  assumptions: z.array(z.string()).meta({ description: "defaults applied and where they come from" }),
  metrics: z.record(z.string(), z.number()).meta({
    description: "flat metric values for rules: element.<position>.<metric>, capacitor.<metric>, <polarity>.<metric>",
  }),
  rules: ruleSetResultSchema.optional().meta({
    description:
      "verdicts of the named rule set on the bridge: each rule on each element, the worst shown and named in element (present when ruleSet was given)",
  }),
  compareToRules: ruleSetResultSchema.optional().meta({ description: "the same for the compareTo bridge" }),
};

// ---- DC ----
const dcElement = z.object({
  position,
  role: z.enum(["conducting", "blocking"]),
  mode: z.string(),
  currentA: z.number(),
  dropV: z.number(),
  lossW: z.number(),
  tjC: z.number(),
  tjMaxC: z.number(),
  reverseV: z.number().meta({ description: "reverse voltage across a blocking element" }),
  reverseRatingV: z.number(),
  thermalLoopGain: z.number(),
});
const dcPolarity = z.discriminatedUnion("outcome", [
  z.object({
    outcome: z.enum(["solved", "over-temperature", "load-undervoltage"]),
    polarity: z.enum(["positive", "negative"]),
    conducting: z.tuple([position, position]).readonly(),
    bridgeInputV: z.number(),
    loadV: z.number(),
    loadCurrentA: z.number(),
    totalDropV: z.number(),
    totalLossW: z.number(),
    elements: z.array(dcElement).readonly(),
    reason: z.string().optional(),
  }),
  z.object({
    outcome: z.literal("thermal-runaway"),
    polarity: z.enum(["positive", "negative"]),
    position,
    reason: z.string(),
    searchedToC: z.number(),
    lossAtSearchEndW: z.number(),
  }),
  z.object({
    outcome: z.literal("load-collapse"),
    polarity: z.enum(["positive", "negative"]),
    reason: z.string(),
    maxDeliverablePowerW: z.number().optional(),
  }),
]);
const dcBridge = z.object({ positive: dcPolarity, negative: dcPolarity });
const saving = z
  .object({
    lossSavingW: z
      .number()
      .meta({ description: "compareTo's total element loss minus the bridge's (positive: the bridge saves)" }),
    hottestTjReductionK: z.number().meta({ description: "compareTo's hottest junction minus the bridge's" }),
  })
  .meta({ description: "present when both bridges solved" });

export const bridgeDcOutput = z.object({
  ...head,
  bridge: dcBridge,
  compareTo: dcBridge.optional(),
  saving: z.object({ positive: saving.optional(), negative: saving.optional() }).optional(),
});
export type BridgeDcOutput = z.infer<typeof bridgeDcOutput>;

// ---- AC ----
const acElement = z.object({
  position,
  mode: z.enum(["junction", "body-diode", "channel"]),
  averageCurrentA: z.number(),
  rmsCurrentA: z.number(),
  peakCurrentA: z.number().meta({ description: "peak repetitive forward current" }),
  conductionAngleDeg: z
    .number()
    .meta({ description: "degrees of the period the element carries more than 0.1 % of its peak" }),
  lossW: z.number(),
  maxReverseV: z.number().meta({ description: "peak repetitive reverse voltage across the element" }),
  tjC: z.number(),
  tjMaxC: z.number(),
  reverseRatingV: z.number(),
});
const steadyState = z.object({
  dcOutputV: z.number(),
  rippleVpp: z.number(),
  outputMinV: z.number(),
  outputMaxV: z.number(),
  loadCurrentA: z.number(),
  loadPowerW: z.number(),
  capacitorRippleCurrentRmsA: z.number(),
  esrLossW: z.number(),
  sourceRmsCurrentA: z.number(),
  sourcePeakCurrentA: z.number(),
  sourcePowerW: z.number(),
  sourceResistanceLossW: z.number(),
  bridgeInputPowerW: z.number(),
  sourcePowerFactor: z.number(),
  efficiency: z.number(),
  energyBalance: z.object({
    sourceEnergyJ: z.number(),
    loadEnergyJ: z.number(),
    elementEnergyJ: z.number(),
    resistanceEnergyJ: z.number(),
    storedEnergyChangeJ: z.number(),
    relativeResidual: z.number(),
  }),
  elements: z.array(acElement).readonly(),
  totalElementLossW: z.number(),
  solver: z.object({
    shootingIterations: z.number(),
    periodsIntegrated: z.number(),
    stepsLastPeriod: z.number(),
    thermalIterations: z.number(),
  }),
  waveform: z
    .object({
      timeS: z.array(z.number()).readonly().meta({ description: "from the source's rising zero, s" }),
      sourceV: z.array(z.number()).readonly(),
      outputV: z.array(z.number()).readonly(),
      elementCurrentA: z
        .object({
          line1High: z.array(z.number()).readonly(),
          line2High: z.array(z.number()).readonly(),
          line1Low: z.array(z.number()).readonly(),
          line2Low: z.array(z.number()).readonly(),
        })
        .meta({ description: "forward current of each element (0 while its pair blocks)" }),
      nodes: z
        .number()
        .int()
        .meta({ description: "integrator nodes of the converged period the samples were picked from" }),
    })
    .optional()
    .meta({
      description:
        "one period of the steady state: the integrator's nodes, ~400 picked evenly in time plus each element's peak and the output's extremes (present when waveform was asked for)",
    }),
});
export const acBridgeOutcome = z.discriminatedUnion("outcome", [
  z.object({ outcome: z.literal("solved"), steadyState }),
  z.object({ outcome: z.enum(["over-temperature", "load-undervoltage"]), steadyState, reason: z.string() }),
  z.object({
    outcome: z.literal("thermal-runaway"),
    position,
    reason: z.string(),
    searchedToC: z.number(),
    lossAtSearchEndW: z.number(),
  }),
  z.object({
    outcome: z.enum(["load-collapse", "no-periodic-steady-state", "no-thermal-convergence"]),
    reason: z.string(),
  }),
  z.object({ outcome: z.literal("invalid-input"), path: z.string(), reason: z.string() }),
]);
export const bridgeAcOutput = z.object({
  ...head,
  bridge: acBridgeOutcome,
  compareTo: acBridgeOutcome.optional(),
  saving: saving.optional(),
});
export type BridgeAcOutput = z.infer<typeof bridgeAcOutput>;
