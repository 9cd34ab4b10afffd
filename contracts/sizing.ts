import { z } from "zod";
import { datasheetMax } from "./datasheet-max.js";
import { provenance } from "./outcome.js";
import { quantity, temperatureC } from "./quantity.js";
import { requirement } from "./requirement.js";
import { candidate } from "./review.js";
import { STAGE_KINDS } from "./stage.js";
import { thermalPath } from "./thermal.js";
import { holdUpCapacitor, inputAfterField, inputDecayField, reverseLoop } from "./turn-off.js";

/** The reverse-current event the controller's turn-off delay is sized for, with its limits. */
export const sizingTurnOff = z
  .strictObject({
    loop: reverseLoop,
    capacitor: holdUpCapacitor,
    outputV: quantity("V", "output voltage before the event (default: the nominal supply)", {
      gt: 0,
      le: 10_000,
    }).optional(),
    inputAfterV: inputAfterField.optional(),
    inputDecay: inputDecayField.optional(),
    tjC: temperatureC("junction temperature at the event (default: the highest ambient)").optional(),
    reverseThresholdV: quantity("V", "reverse drop at which the controller trips (default: the part's)", {
      ge: 0,
      le: 10,
    }).optional(),
    gateChargeC: quantity("C", "gate charge removed at turn-off", { gt: 0, le: 1 }).optional(),
    gateSinkCurrentA: quantity("A", "the driver's gate sink current", { gt: 0, le: 100 }).optional(),
    clampV: quantity("V", "voltage the blocking element clamps at (default: its rated voltage)", {
      gt: 0,
      le: 10_000,
    }).optional(),
    peakReverseCurrentMaxA: quantity("A", "largest reverse-current peak allowed", { gt: 0, le: 1e5 }).optional(),
    absorbedEnergyMaxJ: quantity(
      "J",
      "largest energy the blocking element may absorb at turn-off (e.g. its derated avalanche rating)",
      { gt: 0, le: 1e6 },
    ).optional(),
  })
  .meta({
    description: "the turn-off event: loop, output capacitor, and the reverse-current peak and absorbed-energy limits",
  });

const common = {
  requirement,
  ruleSet: z.string().min(1).max(100).optional().meta({ description: "id of a rule set (default: default)" }),
  turnOff: sizingTurnOff.optional(),
};

export const sizingSpecInput = z
  .strictObject({
    ...common,
    templates: z.array(candidate).min(1).max(16).meta({
      description:
        "one part per family to size (inline or from the catalog): its laws (Rds(on) temperature law and gate-drive points, diode Is(T)) and thermal path are held; the specification says how far each value may go",
    }),
  })
  .meta({ description: "inverse sizing: the part specification a requirement and rule set need, per stage kind" });
export type SizingSpecInput = z.input<typeof sizingSpecInput>;

export const sizingCatalogInput = z
  .strictObject({
    ...common,
    kinds: z
      .array(z.enum(STAGE_KINDS))
      .min(1)
      .optional()
      .meta({ description: "only parts of these stage kinds (default: all)" }),
    thermal: thermalPath
      .optional()
      .meta({ description: "the board's thermal path for every part (default: each part's own)" }),
    datasheetMax: datasheetMax.optional().meta({
      description:
        "the datasheet-maximum corner for a part whose catalog entry carries none (a part's own datasheetMax takes precedence; absent: such a part at typical values)",
    }),
  })
  .meta({ description: "the approved-parts catalog against the specification, ranked as the design review ranks" });
export type SizingCatalogInput = z.input<typeof sizingCatalogInput>;

const stamp = z.object({ id: z.string(), version: z.string(), hash: z.string() });
export const specItem = z.object({
  id: z.string(),
  title: z.string(),
  unit: z.string(),
  bound: z.enum(["at-most", "at-least"]),
  outcome: z.enum(["limit", "unbounded", "impossible", "not-required", "not-determined"]),
  value: z.number().optional().meta({ description: "the limit" }),
  templateValue: z.number().optional().meta({ description: "the template part's own value" }),
  margin: z.number().optional(),
  relativeMargin: z.number().optional(),
  meets: z.boolean().optional(),
  corner: z.string().optional(),
  conditions: z.record(z.string(), z.union([z.number(), z.string()])).optional(),
  source: z
    .discriminatedUnion("kind", [
      z.object({
        kind: z.literal("rule"),
        ruleId: z.string(),
        expression: z.string(),
        severity: z.enum(["fail", "warn"]),
        threshold: z.number().nullable(),
        ruleSet: stamp,
      }),
      z.object({ kind: z.literal("requirement"), field: z.string(), severity: z.enum(["fail", "warn"]) }),
    ])
    .optional(),
  reason: z.string(),
});

const stageLabel = z.object({ kind: z.string(), name: z.string().optional(), partId: z.string().optional() });
const head = { ...provenance, ruleSet: stamp, assumptions: z.array(z.string()) };

export const sizingSpecOutput = z.object({
  ...head,
  specifications: z.array(
    z.object({ index: z.number().int(), label: z.string(), stage: stageLabel, items: z.array(specItem) }),
  ),
});
export type SizingSpecOutput = z.infer<typeof sizingSpecOutput>;

export const sizingCatalogOutput = z.object({
  ...head,
  parts: z.array(
    z.object({
      rank: z.number().int(),
      partId: z.string(),
      label: z.string(),
      stageKind: z.string(),
      verdict: z.enum(["pass", "warn", "incomplete", "fail"]),
      reason: z.string(),
      firstMiss: specItem.optional(),
      worstLossW: z.number().optional(),
      cost: z.number().optional(),
      items: z.array(specItem),
    }),
  ),
});
export type SizingCatalogOutput = z.infer<typeof sizingCatalogOutput>;
