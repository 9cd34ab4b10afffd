import { z } from "zod";
import { load } from "./load.js";
import { provenance } from "./outcome.js";
import { metricRecord, ruleSetResultSchema } from "./rule-set.js";
import { ruleSetRef } from "./rules.js";
import { quantity, temperatureC } from "./quantity.js";
import { stageInput } from "./stage.js";
import { thermalPath } from "./thermal.js";

export const operatingPointInput = z
  .strictObject({
    stage: stageInput,
    supplyV: quantity("V", "open-circuit supply voltage, forward polarity", { gt: 0, le: 10_000 }),
    sourceResistanceOhm: quantity("ohm", "source and wiring resistance (default 0)", { ge: 0, le: 1e6 }).optional(),
    load,
    ambientC: temperatureC("ambient temperature"),
    thermal: thermalPath.optional().meta({ description: "overrides the stage's thermal path for this board" }),
    ruleSet: ruleSetRef
      .optional()
      .meta({ description: "when given, the result carries this rule set's verdicts on the point" }),
    ruleMetrics: metricRecord.optional().meta({
      description:
        "requirement metrics for the rules that the point does not compute (supplyMinV, reverseVMaxV, standbyBudgetA, parallelSources, ...)",
    }),
  })
  .meta({ description: "steady-state electrothermal operating point of one stage" });
export type OperatingPointInput = z.input<typeof operatingPointInput>;

export const CONDUCTION_MODES = [
  "off",
  "junction",
  "body-diode",
  "regulated-drop",
  "fully-enhanced",
  "partially-enhanced",
  "current-limit",
  "cut-off",
] as const;

export const solvedPoint = z.object({
  mode: z.enum(CONDUCTION_MODES),
  currentA: z.number(),
  sourceCurrentA: z.number(),
  stageInputV: z.number(),
  dropV: z.number(),
  loadV: z.number(),
  loadPowerW: z.number(),
  stageLossW: z.number().meta({ description: "heat in the die that carries the load current" }),
  controllerLossW: z.number().meta({ description: "quiescent power of a separate controller" }),
  tjC: z.number(),
  ambientC: z.number(),
  rthKPerW: z.number(),
  channelCurrentA: z.number(),
  bodyDiodeCurrentA: z.number(),
  bodyDiodeTimeFraction: z.number(),
  gateSourceV: z.number().optional(),
  channelResistanceOhm: z.number().optional(),
  thermalLoopGain: z.number().meta({ description: "Rth·dP/dTj at the point; < 1 is stable" }),
  startChatter: z
    .object({
      startV: z.number().meta({ description: "the control's start voltage", unit: "V" }),
      runningInputV: z.number().meta({ description: "stage input with the control running (below startV)", unit: "V" }),
      belowStartInputV: z
        .number()
        .meta({ description: "stage input with the control below start (at or above startV)", unit: "V" }),
    })
    .optional()
    .meta({
      description:
        "present in the chatter band at the start threshold: neither state of the control is self-consistent (a real controller toggles, its hysteresis decides); the point reported is the one below start, the lossier",
    }),
});
export type SolvedPointOutput = z.infer<typeof solvedPoint>;

const base = {
  ...provenance,
  stage: z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() }),
  assumptions: z.array(z.string()).meta({ description: "defaults applied and where they come from" }),
  rules: ruleSetResultSchema
    .optional()
    .meta({ description: "verdicts of the named rule set on this point (present when ruleSet was given)" }),
};

export const operatingPointOutput = z.discriminatedUnion("outcome", [
  z.object({ outcome: z.literal("solved"), ...base, point: solvedPoint }),
  z.object({
    outcome: z.literal("over-temperature"),
    ...base,
    reason: z.string(),
    tjMaxC: z.number(),
    point: solvedPoint,
  }),
  z.object({
    outcome: z.literal("load-undervoltage"),
    ...base,
    reason: z.string(),
    minVoltageV: z.number(),
    point: solvedPoint,
  }),
  z.object({
    outcome: z.literal("thermal-runaway"),
    ...base,
    reason: z.string(),
    evidence: z.object({
      searchedToC: z.number(),
      lossAtSearchEndW: z.number(),
      thermalLoopGainAtSearchEnd: z.number(),
    }),
  }),
  z.object({
    outcome: z.literal("load-collapse"),
    ...base,
    reason: z.string(),
    atJunctionC: z.number(),
    maxDeliverablePowerW: z.number().optional(),
    currentLimitA: z
      .number()
      .optional()
      .meta({ description: "present when the switch's current limit starves the load: the limit it holds", unit: "A" }),
  }),
  z.object({ outcome: z.literal("stage-off"), ...base, reason: z.string(), stageInputV: z.number() }),
]);
export type OperatingPointOutput = z.infer<typeof operatingPointOutput>;
