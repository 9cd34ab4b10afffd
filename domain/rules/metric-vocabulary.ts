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
  "nfet-back-to-back": true,
} as const satisfies Record<StageKind, true>;
export const STAGE_KIND_LIST = Object.keys(STAGE_KINDS) as readonly StageKind[];

const DIODES: readonly StageKind[] = ["pn-diode", "schottky-diode"];
const FETS: readonly StageKind[] = ["pfet-high-side", "nfet-low-side", "nfet-ideal-diode", "nfet-back-to-back"];
const CONTROLLED: readonly StageKind[] = ["nfet-ideal-diode", "integrated-switch", "nfet-back-to-back"];
/** Kinds whose separate controller has an input pin a reversed supply reaches. */
const CONTROLLER_PIN: readonly StageKind[] = ["nfet-ideal-diode", "nfet-back-to-back"];
const OP = "operatingPoint";
const REQ = "requirement (the caller)";
const STAGE = "stage description";
const REVIEW = "the caller today; a design-review analysis later";
const BRIDGE_ELEMENTS: readonly StageKind[] = ["pn-diode", "schottky-diode", "nfet-ideal-diode"];
const RATED: readonly StageKind[] = [...DIODES, ...FETS];

export const METRICS: readonly MetricDef[] = [
  {
    name: "tjWorstC",
    type: "number",
    unit: "°C",
    meaning:
      "junction temperature of the die carrying the load current at the worst condition the analysis covers (self-consistent electrothermal point)",
    stageKinds: "all",
    providedBy:
      "operatingPoint, review (worst corner); oring (each branch); batteryCharge (peak over the charge); bridgeDc (each element, hotter polarity), bridgeAc (each element)",
  },
  {
    name: "lossWorstW",
    type: "number",
    unit: "W",
    meaning: "heat dissipated in that die at the worst corner",
    stageKinds: "all",
    providedBy: OP,
  },
  {
    name: "dropWorstV",
    type: "number",
    unit: "V",
    meaning: "forward drop across the stage at the worst corner",
    stageKinds: "all",
    providedBy: OP,
  },
  {
    name: "loadVMinV",
    type: "number",
    unit: "V",
    meaning: "lowest voltage the load sees (lowest supply, highest current)",
    stageKinds: "all",
    providedBy:
      "operatingPoint, review; oring (node voltage); bridgeDc (lower of the two polarities); bridgeAc (ripple trough)",
  },
  {
    name: "loadMinV",
    type: "number",
    unit: "V",
    meaning: "the load's minimum operating voltage",
    stageKinds: "all",
    providedBy: `${REQ}; a constant-power load's minVoltageV`,
  },
  {
    name: "supplyMinV",
    type: "number",
    unit: "V",
    meaning: "lowest input voltage of the supply class, including cold crank or end of discharge",
    stageKinds: "all",
    providedBy: REQ,
  },
  {
    name: "supplyMaxV",
    type: "number",
    unit: "V",
    meaning: "highest steady input voltage (jump start, charger float)",
    stageKinds: "all",
    providedBy: REQ,
  },
  {
    name: "reverseVMaxV",
    type: "number",
    unit: "V",
    meaning:
      "magnitude of the worst steady reverse voltage the blocking element sees: the reversed supply, or a bridge element's own reverse voltage (DC: across the blocking pair; AC: its peak repetitive value)",
    stageKinds: "all",
    providedBy: `${REQ}; bridgeDc, bridgeAc (each element)`,
  },
  {
    name: "reverseTransientVMaxV",
    type: "number",
    unit: "V",
    meaning:
      "magnitude of the worst negative transient peak the blocking element sees, after any clamp (plus the output it holds: a blocking stage's held output; a P-FET's or low-side N-FET's output where its channel let go)",
    stageKinds: "all",
    providedBy: REVIEW,
  },
  {
    name: "transientVMaxV",
    type: "number",
    unit: "V",
    meaning: "worst positive transient peak at the stage input, after any clamp (load dump, surge)",
    stageKinds: "all",
    providedBy: REVIEW,
  },
  {
    name: "gateSourceVMaxV",
    type: "number",
    unit: "V",
    meaning: "magnitude of the highest gate-source voltage over the steady and transient input range",
    stageKinds: ["pfet-high-side", "nfet-low-side"],
    providedBy: REVIEW,
  },
  {
    name: "gateDriveMinV",
    type: "number",
    unit: "V",
    meaning: "gate-source drive available at the lowest supply",
    stageKinds: FETS,
    providedBy: `${OP} (the drive at its supply)`,
  },
  {
    name: "startVoltageV",
    type: "number",
    unit: "V",
    meaning: "input voltage from which the controller (or integrated switch) runs",
    stageKinds: CONTROLLED,
    providedBy: STAGE,
  },
  {
    name: "quiescentA",
    type: "number",
    unit: "A",
    meaning: "current the stage's control draws from the input to ground (0 for passive stages)",
    stageKinds: "all",
    providedBy: STAGE,
  },
  {
    name: "lossBudgetW",
    type: "number",
    unit: "W",
    meaning: "the product's budget for the input stage's loss at the worst corner",
    stageKinds: "all",
    providedBy: REQ,
  },
  {
    name: "standbyBudgetA",
    type: "number",
    unit: "A",
    meaning: "the product's standby current budget allotted to the input stage",
    stageKinds: "all",
    providedBy: REQ,
  },
  {
    name: "blocksReverseCurrent",
    type: "boolean",
    unit: "-",
    meaning: "the stage turns off when the output rises above the input",
    stageKinds: "all",
    providedBy: STAGE,
  },
  {
    name: "parallelSources",
    type: "boolean",
    unit: "-",
    meaning: "the input is paralleled with another source (ORing, redundant feeds, a second battery)",
    stageKinds: "all",
    providedBy: `${REQ}; oring (true with two sources or more)`,
  },
  {
    name: "holdUpRequired",
    type: "boolean",
    unit: "-",
    meaning: "the load must ride through an input dropout on its own capacitance",
    stageKinds: "all",
    providedBy: `${REQ}; holdUp (true when requiredHoldUpS is given)`,
  },
  {
    name: "reverseTjC",
    type: "number",
    unit: "°C",
    meaning:
      "junction temperature of the blocking element in steady reverse polarity, heated by its own leakage at the highest ambient (self-consistent)",
    stageKinds: "all",
    providedBy: "review (steady reverse polarity)",
  },
  {
    name: "reverseLeakageRunaway",
    type: "boolean",
    unit: "-",
    meaning:
      "in steady reverse polarity the blocking element's leakage heats it faster than its thermal path sheds it: no stable junction temperature",
    stageKinds: "all",
    providedBy: "review (steady reverse polarity)",
  },
  {
    name: "controllerReverseVMaxV",
    type: "number",
    unit: "V",
    meaning:
      "magnitude of the highest reverse voltage on the controller's input pin: the steady reversed supply or a negative transient peak after any clamp",
    stageKinds: CONTROLLER_PIN,
    providedBy: "review (steady reverse polarity and negative transients)",
  },
  {
    name: "clampEnergyJ",
    type: "number",
    unit: "J",
    meaning:
      "largest energy the design's input clamp absorbs in one pulse of the requirement's transients (0 when it never conducts)",
    stageKinds: "all",
    providedBy: "review (transients, with requirement.inputClamp)",
  },
  {
    name: "clampEnergyRatingJ",
    type: "number",
    unit: "J",
    meaning: "the input clamp's single-pulse energy rating",
    stageKinds: "all",
    providedBy: `${REQ} (inputClamp.energyJ)`,
  },
  {
    name: "clampPeakCurrentA",
    type: "number",
    unit: "A",
    meaning:
      "largest peak current through the design's input clamp over the requirement's transients (0 when it never conducts)",
    stageKinds: "all",
    providedBy: "review (transients, with requirement.inputClamp)",
  },
  {
    name: "clampPeakCurrentRatingA",
    type: "number",
    unit: "A",
    meaning: "the input clamp's peak pulse current rating",
    stageKinds: "all",
    providedBy: `${REQ} (inputClamp.peakCurrentA)`,
  },
  {
    name: "clampPeakPowerW",
    type: "number",
    unit: "W",
    meaning:
      "peak power in the design's input clamp (its voltage at the peak current times that current) at the pulse that uses the largest share of its power rating (0 when it never conducts)",
    stageKinds: "all",
    providedBy: "review (transients, with requirement.inputClamp)",
  },
  {
    name: "clampPeakPowerAllowedW",
    type: "number",
    unit: "W",
    meaning:
      "the input clamp's peak pulse power rating read at that pulse: scaled by sqrt(reference width / the pulse's current half-width) and derated linearly to 0 at its Tj(max) from the highest ambient",
    stageKinds: "all",
    providedBy: "review (transients, with requirement.inputClamp.peakPulsePowerW)",
  },
  {
    name: "clampTrainTjC",
    type: "number",
    unit: "°C",
    meaning:
      "the design's input clamp junction at the end of the hottest test's pulse train (each pulse as a rectangle at its peak power carrying its energy, repeated at the test's interval and count, from the highest ambient, through the clamp's Foster network); the highest ambient when it conducts in no pulse",
    stageKinds: "all",
    providedBy: "review (transients, with requirement.inputClamp.thermal)",
  },
  {
    name: "clampTjMaxC",
    type: "number",
    unit: "°C",
    meaning: "the input clamp's maximum junction temperature",
    stageKinds: "all",
    providedBy: `${REQ} (inputClamp.tjMaxC, default 150 °C)`,
  },
  {
    name: "clampStandoffV",
    type: "number",
    unit: "V",
    meaning:
      "the input clamp's stand-off voltage (bidirectional: it must not conduct the steady supply nor the steady reversed supply)",
    stageKinds: "all",
    providedBy: `${REQ} (inputClamp.standoffV)`,
  },
  {
    name: "jumpStartV",
    type: "number",
    unit: "V",
    meaning: "jump-start voltage of the supply class (a steady overvoltage lasting about a minute)",
    stageKinds: "all",
    providedBy: `${REQ}; the supply class where it has one`,
  },
  {
    name: "supplyOvervoltageV",
    type: "number",
    unit: "V",
    meaning:
      "highest steady overvoltage of the supply: jump start (about a minute), long-term overvoltage (a failed regulator, about an hour) or the top of the abnormal service range, whichever is highest",
    stageKinds: "all",
    providedBy: `${REQ}; the supply class where it has them`,
  },
  {
    name: "startProfileMinV",
    type: "number",
    unit: "V",
    meaning: "lowest supply of the requirement's start-up (cold-crank) profile",
    stageKinds: "all",
    providedBy: `${REQ} (startProfile)`,
  },
  {
    name: "startProfileDropoutS",
    type: "number",
    unit: "s",
    meaning:
      "time along the start-up profile during which the load has no operating point (collapse, undervoltage or stage off), at either ambient",
    stageKinds: "all",
    providedBy: "review (start-up profile)",
  },
  {
    name: "inrushTjC",
    type: "number",
    unit: "°C",
    meaning:
      "highest junction temperature while the stage charges the output capacitance at start-up (from the highest ambient, through the transient thermal network; without one the steady path at the peak loss, an upper bound); at a thermal shutdown its temperature, at a stall the steady junction",
    stageKinds: [...FETS, "integrated-switch"],
    providedBy: "review (requirement.inrush)",
  },
  {
    name: "inrushCharges",
    type: "boolean",
    unit: "-",
    meaning:
      "whether the start-up charge of the output capacitance completes: false where the load takes the whole current limit (the output stalls) or the switch reaches its thermal shutdown first",
    stageKinds: [...FETS, "integrated-switch"],
    providedBy: "review (requirement.inrush)",
  },
  {
    name: "inrushSoaCurrentA",
    type: "number",
    unit: "A",
    meaning:
      "drain current at the inrush pulse's peak power, the pulse taken as the rectangle of its energy at that power (width E/Ppeak)",
    stageKinds: FETS,
    providedBy: "review (requirement.inrush, mosfet.soa)",
  },
  {
    name: "inrushSoaAllowedA",
    type: "number",
    unit: "A",
    meaning:
      "the MOSFET's datasheet single-pulse SOA lines at that pulse's Vds and width (log-log between points and lines), derated from the 25 °C case to the starting junction by (Tj,max − Tstart)/(Tj,max − 25 °C)",
    stageKinds: FETS,
    providedBy: "review (requirement.inrush, mosfet.soa)",
  },
  {
    name: "overvoltageCutoffV",
    type: "number",
    unit: "V",
    meaning:
      "the lowest input at which an integrated switch can be open in service: its overvoltage cut-off threshold at its lowest (datasheetMax.overvoltageCutoffMinV, else the typical), or, where a surge or steady overvoltage takes the input above it, the level it recloses below (threshold − overvoltageHysteresisV)",
    stageKinds: ["integrated-switch"],
    providedBy: `${STAGE} (overvoltageCutoffV), in the review`,
  },
  {
    name: "stageCurrentMaxA",
    type: "number",
    unit: "A",
    meaning:
      "highest current through the stage over the review's corners (a constant-power load's at the lowest supply; a corner whose load collapses at the switch's current limit counts as the limit)",
    stageKinds: ["integrated-switch"],
    providedBy: "review (corners), for a stage with a current limit",
  },
  {
    name: "switchCurrentLimitA",
    type: "number",
    unit: "A",
    meaning: "current an integrated switch limits to, at its lowest: datasheetMax.currentLimitMinA, else the typical",
    stageKinds: ["integrated-switch"],
    providedBy: `${STAGE} (currentLimitA), in the review`,
  },
  {
    name: "cornersWithoutOperatingPoint",
    type: "number",
    unit: "1",
    meaning:
      "how many corners of the review have no operating point (a collapse at a current limit, no steady state): the stage cannot carry the load there, so the corner figures (tjWorstC, loadVMinV, ...) are unavailable; the candidate's worst.cornersWithoutOperatingPoint names each corner and why",
    stageKinds: "all",
    providedBy: "review (its corners)",
  },
  {
    name: "thermalShutdownInService",
    type: "boolean",
    unit: "-",
    meaning:
      "a steady corner or the start-up profile heats an integrated switch to its thermal shutdown temperature (Tj = Ta + Rth·P at or above thermalShutdownC; at the current limit P = (V_in − V_load)·I_lim, at the limit that heats more; a corner in thermal runaway counts where the shutdown lies within the search; the profile's junction through the Foster network, else each instant's steady Tj): the switch turns off and the load loses its supply, latched off or cycling when it retries (afterThermalShutdown)",
    stageKinds: ["integrated-switch"],
    providedBy: `review (its corners and start-up profiles); ${OP} (its point), for a stage with thermalShutdownC`,
  },
  {
    name: "loadTransientVMaxV",
    type: "number",
    unit: "V",
    meaning:
      "highest voltage the load sees: the highest steady supply, the steady overvoltages and every positive pulse after the design's clamp, each cut to an integrated switch's overvoltage threshold (at its highest: datasheetMax.overvoltageCutoffMaxV, else the typical) plus what the input rises in its response time",
    stageKinds: "all",
    providedBy: "review",
  },
  {
    name: "loadMaxV",
    type: "number",
    unit: "V",
    meaning: "highest voltage the load withstands",
    stageKinds: "all",
    providedBy: `${REQ} (loadMaxV)`,
  },
  {
    name: "peakReverseCurrentA",
    type: "number",
    unit: "A",
    meaning:
      "peak current flowing backwards through the stage when the input is shorted or steps lower (magnitude); in the review also the largest over the negative pulses at a P-FET or low-side N-FET (applied with the supply disconnected, ISO 7637-2 pulse 1, or riding on it through the battery's Thevenin equivalent, ISO 7637-2 pulse 3a)",
    stageKinds: "all",
    providedBy: "turnOff",
  },
  {
    name: "absorbedEnergyJ",
    type: "number",
    unit: "J",
    meaning:
      "energy the blocking element absorbs clamping the loop inductance after it turns off (Vclamp·∫|i|dt); 0 when the current is back at zero by then or the stage never turns off",
    stageKinds: "all",
    providedBy: "turnOff",
  },
  {
    name: "loadReverseVMaxV",
    type: "number",
    unit: "V",
    meaning:
      "reverse voltage the output (the load's input) reaches during the turn-off event, magnitude: minus the output's lowest voltage, 0 when it stays at or above 0 V (a negative input pulling it below through a P-FET's or low-side N-FET's channel still on); in the review also the largest over the negative pulses at a P-FET or low-side N-FET (applied with the supply disconnected, ISO 7637-2 pulse 1, or riding on it through the battery's Thevenin equivalent, ISO 7637-2 pulse 3a)",
    stageKinds: "all",
    providedBy: "turnOff",
  },
  {
    name: "loadReverseLimitV",
    type: "number",
    unit: "V",
    meaning: "the largest reverse voltage the load tolerates at its input (magnitude)",
    stageKinds: "all",
    providedBy: `${REQ} (turnOff.loadReverseLimitV; the turnOff analysis's loadReverseLimitV)`,
  },
  {
    name: "eventTrainTjC",
    type: "number",
    unit: "°C",
    meaning:
      "the blocking element's junction at the end of the review's repeated turn-off events (turnOff.repetition): each clamp phase as a rectangle at its peak power Vcl·I carrying its absorbed energy, repeated at the interval and count, from the event's Tj, through the candidate's Foster network",
    stageKinds: "all",
    providedBy: "review (requirement.turnOff.repetition, with the candidate's transientThermal)",
  },
  {
    name: "eventTjC",
    type: "number",
    unit: "°C",
    meaning: "junction temperature of the stage when the event starts (the avalanche rating is derated from it)",
    stageKinds: "all",
    providedBy: "turnOff (its tjC)",
  },
  {
    name: "vdsBreakdownColdV",
    type: "number",
    unit: "V",
    meaning:
      "a MOSFET's drain-source breakdown at the requirement's lowest ambient: vdsMaxV scaled by its temperature coefficient from 25 °C down (no credit above 25 °C)",
    stageKinds: FETS,
    providedBy: "review (mosfet.vdsTempCoPerK, default +0.1 %/K)",
  },
  {
    name: "gateOverdriveColdV",
    type: "number",
    unit: "V",
    meaning:
      "gate drive at the lowest supply less the MOSFET's threshold at the coldest ambient (Vth(max) where the datasheet maximum is given, moved by mosfet.thresholdTempCoVPerK): at 0 or less the channel does not turn on",
    stageKinds: FETS,
    providedBy: "review and sizing (mosfet.thresholdTempCoVPerK or thresholdAtTj; none given: Vth held at 25 °C)",
  },
  {
    name: "startChatter",
    type: "boolean",
    unit: "-",
    meaning:
      "the supply lies in the chatter band at the control's start threshold: running, the source drop pulls the stage input below the start voltage; below start, it is at or above it, so neither state holds (at any corner of the review)",
    stageKinds: CONTROLLED,
    providedBy: `review (its corners); ${OP} (its point)`,
  },
  {
    name: "avalancheEnergyAtTjJ",
    type: "number",
    unit: "J",
    meaning:
      "the blocking element's single-pulse avalanche rating at the event's starting junction temperature: part.avalancheEnergyJ derated linearly to 0 at Tj(max), no credit below 25 °C",
    stageKinds: "all",
    providedBy: "turnOff (from its tjC and the rating)",
  },
  {
    name: "turnOffRepetitive",
    type: "boolean",
    unit: "-",
    meaning:
      "the turn-off event repeats in service (each switch-off or each pulse of a train, not a one-off fault): its energy is held to the repetitive avalanche rating too",
    stageKinds: "all",
    providedBy: "turnOff's repetitive; the requirement's turnOff.repetitive (default false)",
  },
  {
    name: "holdUpS",
    type: "number",
    unit: "s",
    meaning: "time the output stays above the load's minimum after the input is lost, including the turn-off event",
    stageKinds: "all",
    providedBy: "holdUp (each stage)",
  },
  {
    name: "holdUpRequiredS",
    type: "number",
    unit: "s",
    meaning: "hold-up time the product must achieve",
    stageKinds: "all",
    providedBy: `${REQ}; holdUp's requiredHoldUpS`,
  },
  {
    name: "reverseCurrentA",
    type: "number",
    unit: "A",
    meaning: "steady current flowing backwards through the stage into its source (a blocking stage's leakage included)",
    stageKinds: "all",
    providedBy: "oring (each branch)",
  },
  {
    name: "reverseCurrentBudgetA",
    type: "number",
    unit: "A",
    meaning:
      "largest steady reverse current a source may take (a battery's self-discharge allowance, a supply that cannot sink)",
    stageKinds: "all",
    providedBy: REQ,
  },
  {
    name: "targetCanDrainSource",
    type: "boolean",
    unit: "-",
    meaning:
      "in battery-to-battery charging, the stage lets the target battery discharge into a source that has fallen below it",
    stageKinds: "all",
    providedBy: "batteryCharge (each stage)",
  },
  {
    name: "peakRepetitiveCurrentA",
    type: "number",
    unit: "A",
    meaning: "peak forward current of a bridge element in each period (the reservoir capacitor's charging pulse)",
    stageKinds: BRIDGE_ELEMENTS,
    providedBy: "bridgeAc (each element)",
  },
  {
    name: "capacitorRippleCurrentA",
    type: "number",
    unit: "A",
    meaning: "RMS ripple current in the reservoir capacitor",
    stageKinds: "all",
    providedBy: "bridgeAc",
  },
  {
    name: "capacitorRippleRatingA",
    type: "number",
    unit: "A",
    meaning: "the reservoir capacitor's rated RMS ripple current",
    stageKinds: "all",
    providedBy: "the caller (bridgeAc's capacitorRippleRatingA)",
  },
];

/** Part parameters, read in expressions as `part.<name>`. */
export const PART_PARAMETERS: readonly MetricDef[] = [
  {
    name: "tjMaxC",
    type: "number",
    unit: "°C",
    meaning: "maximum junction temperature of the die carrying the load current",
    stageKinds: "all",
    providedBy: STAGE,
  },
  {
    name: "vrrmV",
    type: "number",
    unit: "V",
    meaning: "diode repetitive peak reverse voltage rating",
    stageKinds: DIODES,
    providedBy: STAGE,
  },
  {
    name: "vdsMaxV",
    type: "number",
    unit: "V",
    meaning: "MOSFET drain-source voltage rating",
    stageKinds: FETS,
    providedBy: STAGE,
  },
  {
    name: "vgsMaxV",
    type: "number",
    unit: "V",
    meaning: "MOSFET gate-source voltage rating (magnitude)",
    stageKinds: FETS,
    providedBy: STAGE,
  },
  {
    name: "vgsOnV",
    type: "number",
    unit: "V",
    meaning:
      "gate-source voltage of the highest datasheet Rds(on) point: the drive needed to reach the rated on-resistance",
    stageKinds: FETS,
    providedBy: STAGE,
  },
  {
    name: "maxInputV",
    type: "number",
    unit: "V",
    meaning: "highest input voltage the controller or integrated switch is rated for",
    stageKinds: CONTROLLED,
    providedBy: STAGE,
  },
  {
    name: "controllerReverseRatingV",
    type: "number",
    unit: "V",
    meaning: "reverse voltage the controller's input pin withstands (magnitude)",
    stageKinds: CONTROLLER_PIN,
    providedBy: `${STAGE} (controller.reverseRatingV)`,
  },
  {
    name: "switchReverseRatingV",
    type: "number",
    unit: "V",
    meaning: "reverse voltage an integrated switch blocks (magnitude)",
    stageKinds: ["integrated-switch"],
    providedBy: `${STAGE} (reverseRatingV)`,
  },
  {
    name: "avalancheCurrentA",
    type: "number",
    unit: "A",
    meaning:
      "single-pulse avalanche current rating (IAS) of a MOSFET: the current at the start of avalanche it survives",
    stageKinds: FETS,
    providedBy: `${STAGE} (mosfet avalancheCurrentA)`,
  },
  {
    name: "avalancheEnergyJ",
    type: "number",
    unit: "J",
    meaning:
      "single-pulse avalanche energy rating (EAS) of the blocking element, at 25 °C starting junction temperature",
    stageKinds: RATED,
    providedBy: `${STAGE} (diode or mosfet avalancheEnergyJ); turnOff's avalancheRatingJ overrides`,
  },
  {
    name: "repetitiveAvalancheEnergyJ",
    type: "number",
    unit: "J",
    meaning: "repetitive avalanche energy rating (EAR) of a MOSFET, per event",
    stageKinds: FETS,
    providedBy: `${STAGE} (mosfet repetitiveAvalancheEnergyJ)`,
  },
  {
    name: "ifrmA",
    type: "number",
    unit: "A",
    meaning: "repetitive peak forward current rating: a diode's IFRM, a MOSFET's repetitive pulsed drain current",
    stageKinds: RATED,
    providedBy: `${STAGE} (diode or mosfet peakRepetitiveCurrentA)`,
  },
];

/**
 * The soundness declaration of the vocabulary. A "computed" metric is a stress or figure an
 * analysis works out (each analysis lists what it computes in its `*_COMPUTES`, collected in
 * domain/rules/computed-metrics.ts); a "requirement" metric is the caller's (a budget, a rating
 * outside the stage, a profile's bottom); a "stage" metric describes the stage. Every computed
 * metric and every part parameter must be read by a rule's condition in every built-in rule set
 * for each stage kind it applies to, and every requirement metric by at least one rule of each
 * set (test/domain/rules/soundness-invariant.test.ts), except for the kinds `notAssessed`
 * names, with why. A metric without a role here fails that test too.
 */
export type MetricRole = "computed" | "requirement" | "stage";
export interface NotAssessed {
  readonly stageKinds: "all" | readonly StageKind[];
  readonly reason: string;
}
export interface MetricAssessment {
  readonly role: MetricRole;
  readonly notAssessed?: NotAssessed;
}

const computed: MetricAssessment = { role: "computed" };
const requirement: MetricAssessment = { role: "requirement" };
const stageRole: MetricAssessment = { role: "stage" };

export const METRIC_ROLES: Readonly<Record<string, MetricAssessment>> = {
  tjWorstC: computed,
  lossWorstW: computed,
  dropWorstV: {
    role: "computed",
    notAssessed: {
      stageKinds: "all",
      reason:
        "a drop has no limit of its own: its effects are ruled through loadVMinV (the load voltage) and lossWorstW / tjWorstC (the heat)",
    },
  },
  loadVMinV: computed,
  loadMinV: requirement,
  supplyMinV: requirement,
  supplyMaxV: requirement,
  reverseVMaxV: computed,
  reverseTransientVMaxV: computed,
  transientVMaxV: {
    role: "computed",
    notAssessed: {
      stageKinds: ["pn-diode", "schottky-diode", "pfet-high-side", "nfet-low-side"],
      reason:
        "a conducting diode or MOSFET passes a positive surge on to the load at its forward drop (its own voltage stays small); a MOSFET's gate stress from the surge is ruled through gateSourceVMaxV; what reaches the load through loadTransientVMaxV",
    },
  },
  gateSourceVMaxV: computed,
  gateDriveMinV: computed,
  startVoltageV: stageRole,
  quiescentA: stageRole,
  lossBudgetW: requirement,
  standbyBudgetA: requirement,
  blocksReverseCurrent: stageRole,
  parallelSources: requirement,
  holdUpRequired: requirement,
  reverseTjC: computed,
  reverseLeakageRunaway: computed,
  controllerReverseVMaxV: computed,
  clampEnergyJ: computed,
  clampEnergyRatingJ: requirement,
  clampPeakCurrentA: computed,
  clampPeakCurrentRatingA: requirement,
  clampStandoffV: requirement,
  clampPeakPowerW: computed,
  clampPeakPowerAllowedW: computed,
  clampTrainTjC: computed,
  clampTjMaxC: requirement,
  jumpStartV: requirement,
  supplyOvervoltageV: requirement,
  startProfileMinV: requirement,
  startProfileDropoutS: computed,
  inrushTjC: computed,
  inrushCharges: computed,
  inrushSoaCurrentA: computed,
  inrushSoaAllowedA: computed,
  overvoltageCutoffV: stageRole,
  stageCurrentMaxA: computed,
  switchCurrentLimitA: stageRole,
  thermalShutdownInService: computed,
  cornersWithoutOperatingPoint: computed,
  loadTransientVMaxV: computed,
  loadMaxV: requirement,
  peakReverseCurrentA: {
    role: "computed",
    notAssessed: {
      stageKinds: ["pn-diode", "schottky-diode", "integrated-switch"],
      reason:
        "a diode's or integrated switch's reverse-current peak has no rating of its own here: the energy it drives into the blocking element is ruled by avalanche-energy and the charge it costs by the hold-up rules",
    },
  },
  absorbedEnergyJ: computed,
  loadReverseVMaxV: computed,
  eventTrainTjC: computed,
  loadReverseLimitV: requirement,
  eventTjC: {
    role: "computed",
    notAssessed: {
      stageKinds: "all",
      reason: "the event's starting Tj is ruled through avalancheEnergyAtTjJ, the avalanche rating derated to it",
    },
  },
  avalancheEnergyAtTjJ: computed,
  vdsBreakdownColdV: computed,
  startChatter: computed,
  gateOverdriveColdV: computed,
  turnOffRepetitive: requirement,
  holdUpS: computed,
  holdUpRequiredS: requirement,
  reverseCurrentA: computed,
  reverseCurrentBudgetA: requirement,
  targetCanDrainSource: computed,
  peakRepetitiveCurrentA: computed,
  capacitorRippleCurrentA: computed,
  capacitorRippleRatingA: requirement,
};

/** Part parameters a built-in set does not compare for some kinds, with why (see METRIC_ROLES). */
export const PART_NOT_ASSESSED: Readonly<Record<string, NotAssessed>> = {
  avalancheEnergyJ: {
    stageKinds: "all",
    reason:
      "the 25 °C rating is ruled through avalancheEnergyAtTjJ, the same rating derated to the event's starting Tj",
  },
  vgsMaxV: {
    stageKinds: CONTROLLER_PIN,
    reason:
      "the controller drives the gate from its own regulated supply; no analysis computes that drive against the MOSFET's Vgs rating",
  },
  ifrmA: {
    stageKinds: ["pfet-high-side", "nfet-low-side", "nfet-back-to-back"],
    reason: "only bridge elements carry a repetitive charging pulse (bridgeAc); these kinds are not bridge elements",
  },
};

const METRIC_INDEX = new Map(METRICS.map((m) => [m.name, m] as const));
const PART_INDEX = new Map(PART_PARAMETERS.map((m) => [m.name, m] as const));

export function metricDef(name: string): MetricDef | undefined {
  return METRIC_INDEX.get(name);
}

export function partParameterDef(name: string): MetricDef | undefined {
  return PART_INDEX.get(name);
}
