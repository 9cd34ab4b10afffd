import type { StageKind } from "../stages/stage-model.js";

/**
 * The metric vocabulary: the only names a rule expression may use. Metrics are plain SI numbers
 * (unit in the name) or booleans; part parameters are read as `part.<name>`. The docs page
 * docs/metrics.md is generated from these lists (scripts/generate-metrics-doc.ts).
 */
export interface MetricDef {
  readonly name: string;
  readonly type: "number" | "boolean";
  /** Unit of the number ("1" for a ratio, "-" for a boolean). */
  readonly unit: string;
  readonly meaning: string;
  /** Stage kinds for which the metric is meaningful ("all" for every kind). */
  readonly stageKinds: "all" | readonly StageKind[];
  /** Where the number comes from: an analysis of this service, the stage description, or the requirement. */
  readonly providedBy: string;
}

/** Every stage kind the rules know; `satisfies` makes tsc fail when a kind is added without it. */
export const STAGE_KINDS = {
  "pn-diode": true,
  "schottky-diode": true,
  "pfet-high-side": true,
  "nfet-low-side": true,
  "nfet-ideal-diode": true,
  "integrated-switch": true,
} as const satisfies Record<StageKind, true>;
export const STAGE_KIND_LIST = Object.keys(STAGE_KINDS) as readonly StageKind[];

const DIODES: readonly StageKind[] = ["pn-diode", "schottky-diode"];
const FETS: readonly StageKind[] = ["pfet-high-side", "nfet-low-side", "nfet-ideal-diode"];
const CONTROLLED: readonly StageKind[] = ["nfet-ideal-diode", "integrated-switch"];
const OP = "operatingPoint";
const REQ = "requirement (the caller)";
const STAGE = "stage description";
const REVIEW = "the caller today; a design-review analysis later";

export const METRICS: readonly MetricDef[] = [
  { name: "tjWorstC", type: "number", unit: "°C", meaning: "junction temperature of the die carrying the load current at the worst corner (self-consistent electrothermal point)", stageKinds: "all", providedBy: OP },
  { name: "lossWorstW", type: "number", unit: "W", meaning: "heat dissipated in that die at the worst corner", stageKinds: "all", providedBy: OP },
  { name: "dropWorstV", type: "number", unit: "V", meaning: "forward drop across the stage at the worst corner", stageKinds: "all", providedBy: OP },
  { name: "loadVMinV", type: "number", unit: "V", meaning: "lowest voltage the load sees (lowest supply, highest current)", stageKinds: "all", providedBy: OP },
  { name: "loadMinV", type: "number", unit: "V", meaning: "the load's minimum operating voltage", stageKinds: "all", providedBy: REQ },
  { name: "supplyMinV", type: "number", unit: "V", meaning: "lowest input voltage of the supply class, including cold crank or end of discharge", stageKinds: "all", providedBy: REQ },
  { name: "supplyMaxV", type: "number", unit: "V", meaning: "highest steady input voltage (jump start, charger float)", stageKinds: "all", providedBy: REQ },
  { name: "reverseVMaxV", type: "number", unit: "V", meaning: "magnitude of the worst steady reverse input voltage (reversed supply)", stageKinds: "all", providedBy: REQ },
  { name: "reverseTransientVMaxV", type: "number", unit: "V", meaning: "magnitude of the worst negative transient peak the blocking element sees, after any clamp", stageKinds: "all", providedBy: REVIEW },
  { name: "transientVMaxV", type: "number", unit: "V", meaning: "worst positive transient peak at the stage input, after any clamp (load dump, surge)", stageKinds: "all", providedBy: REVIEW },
  { name: "gateSourceVMaxV", type: "number", unit: "V", meaning: "magnitude of the highest gate-source voltage over the steady and transient input range", stageKinds: ["pfet-high-side", "nfet-low-side"], providedBy: REVIEW },
  { name: "gateDriveMinV", type: "number", unit: "V", meaning: "gate-source drive available at the lowest supply", stageKinds: FETS, providedBy: `${OP} (the drive at its supply)` },
  { name: "startVoltageV", type: "number", unit: "V", meaning: "input voltage from which the controller (or integrated switch) runs", stageKinds: CONTROLLED, providedBy: STAGE },
  { name: "quiescentA", type: "number", unit: "A", meaning: "current the stage's control draws from the input to ground (0 for passive stages)", stageKinds: "all", providedBy: STAGE },
  { name: "lossBudgetW", type: "number", unit: "W", meaning: "the product's budget for the input stage's loss at the worst corner", stageKinds: "all", providedBy: REQ },
  { name: "standbyBudgetA", type: "number", unit: "A", meaning: "the product's standby current budget allotted to the input stage", stageKinds: "all", providedBy: REQ },
  { name: "blocksReverseCurrent", type: "boolean", unit: "-", meaning: "the stage turns off when the output rises above the input", stageKinds: "all", providedBy: STAGE },
  { name: "parallelSources", type: "boolean", unit: "-", meaning: "the input is paralleled with another source (ORing, redundant feeds, a second battery)", stageKinds: "all", providedBy: REQ },
  { name: "holdUpRequired", type: "boolean", unit: "-", meaning: "the load must ride through an input dropout on its own capacitance", stageKinds: "all", providedBy: REQ },
];

/** Part parameters, read in expressions as `part.<name>`. */
export const PART_PARAMETERS: readonly MetricDef[] = [
  { name: "tjMaxC", type: "number", unit: "°C", meaning: "maximum junction temperature of the die carrying the load current", stageKinds: "all", providedBy: STAGE },
  { name: "vrrmV", type: "number", unit: "V", meaning: "diode repetitive peak reverse voltage rating", stageKinds: DIODES, providedBy: STAGE },
  { name: "vdsMaxV", type: "number", unit: "V", meaning: "MOSFET drain-source voltage rating", stageKinds: FETS, providedBy: STAGE },
  { name: "vgsMaxV", type: "number", unit: "V", meaning: "MOSFET gate-source voltage rating (magnitude)", stageKinds: FETS, providedBy: STAGE },
  { name: "vgsOnV", type: "number", unit: "V", meaning: "gate-source voltage of the highest datasheet Rds(on) point: the drive needed to reach the rated on-resistance", stageKinds: FETS, providedBy: STAGE },
  { name: "maxInputV", type: "number", unit: "V", meaning: "highest input voltage the controller or integrated switch is rated for", stageKinds: CONTROLLED, providedBy: STAGE },
];

const METRIC_INDEX = new Map(METRICS.map((m) => [m.name, m] as const));
const PART_INDEX = new Map(PART_PARAMETERS.map((m) => [m.name, m] as const));

export function metricDef(name: string): MetricDef | undefined {
  return METRIC_INDEX.get(name);
}

export function partParameterDef(name: string): MetricDef | undefined {
  return PART_INDEX.get(name);
}
