import { blocksReverseCurrent } from "../checks/stage-ratings.js";
import type { RuleInput } from "./rule-model.js";
import type { OperatingPointOutcome } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { type StageModel, stageQuiescentA, stageTjMaxC } from "../stages/stage-model.js";
import { otherAnalysesMetrics } from "./rule-input-draft.js";

/** Metrics the operating point computes; a caller may not supply them alongside it. */
export const OPERATING_POINT_METRICS = ["tjWorstC", "lossWorstW", "dropWorstV", "loadVMinV", "gateDriveMinV"] as const;

/**
 * Map an operating point, its stage and its load to rule metrics. The point is taken as the worst
 * corner the caller chose (lowest supply, highest current and ambient): tjWorstC = Tj,
 * lossWorstW = heat in the die, dropWorstV = forward drop, loadVMinV = load voltage,
 * gateDriveMinV = gate-source drive at this supply. Without a point (runaway, collapse, stage
 * off) those names are marked unavailable with the outcome, so their rules are not applicable
 * and the set's outcome is at best "incomplete", never "pass".
 */
export function operatingPointRuleInput(stage: StageModel, load: LoadModel, o: OperatingPointOutcome, callerMetrics: Readonly<Record<string, number | boolean>>): RuleInput {
  const metrics: Record<string, number | boolean> = { ...callerMetrics, ...stageMetrics(stage) };
  if (load.kind === "constant-power") metrics["loadMinV"] = load.minVoltageV;
  const unavailable: Record<string, string> = {};
  if (o.outcome === "solved" || o.outcome === "over-temperature" || o.outcome === "load-undervoltage") {
    const p = o.point;
    metrics["tjWorstC"] = p.tjC;
    metrics["lossWorstW"] = p.dieLossW;
    metrics["dropWorstV"] = p.forward.dropV;
    metrics["loadVMinV"] = p.loadV;
    if (p.forward.gateSourceV !== undefined && stage.kind !== "pn-diode" && stage.kind !== "schottky-diode" && stage.kind !== "integrated-switch") {
      metrics["gateDriveMinV"] = p.forward.gateSourceV;
    }
  } else {
    for (const n of OPERATING_POINT_METRICS) unavailable[n] = `no operating point (${o.outcome}: ${o.reason})`;
  }
  return { stageKind: stage.kind, metrics, part: partParameters(stage), unavailable, notRequired: otherAnalysesMetrics(metrics, "operatingPoint") };
}

export function stageMetrics(stage: StageModel): Record<string, number | boolean> {
  // Whether the stage turns off on reverse current comes from one place (stage-ratings.ts).
  const m: Record<string, number | boolean> = { quiescentA: stageQuiescentA(stage), blocksReverseCurrent: blocksReverseCurrent(stage) };
  switch (stage.kind) {
    case "nfet-ideal-diode":
      m["startVoltageV"] = stage.controller.startV;
      return m;
    case "integrated-switch":
      m["startVoltageV"] = stage.startV;
      return m;
    default:
      return m;
  }
}

export function partParameters(stage: StageModel): Record<string, number> {
  const part: Record<string, number> = { tjMaxC: stageTjMaxC(stage) };
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      part["vrrmV"] = stage.reverseRatingV;
      break;
    case "pfet-high-side":
    case "nfet-low-side":
    case "nfet-ideal-diode": {
      part["vdsMaxV"] = stage.mosfet.vdsMaxV;
      part["vgsMaxV"] = stage.mosfet.vgsMaxV;
      const top = stage.mosfet.channel.rdsOnPoints.at(-1);
      if (top !== undefined) part["vgsOnV"] = top.gateSourceV;
      if (stage.mosfet.avalancheCurrentA !== undefined) part["avalancheCurrentA"] = stage.mosfet.avalancheCurrentA;
      if (stage.kind === "nfet-ideal-diode" && stage.controller.maxInputV !== undefined) part["maxInputV"] = stage.controller.maxInputV;
      if (stage.kind === "nfet-ideal-diode" && stage.controller.reverseRatingV !== undefined) part["controllerReverseRatingV"] = stage.controller.reverseRatingV;
      break;
    }
    case "integrated-switch":
      part["maxInputV"] = stage.maxVoltageV;
      if (stage.reverseRatingV !== undefined) part["switchReverseRatingV"] = stage.reverseRatingV;
      break;
  }
  return part;
}

/**
 * Part ratings the stage does not state that a stress of the design review or the turn-off event
 * is compared with: the rule is then a gap (it cannot pass), with why.
 */
export function missingRatings(stage: StageModel): Record<string, string> {
  const out: Record<string, string> = {};
  switch (stage.kind) {
    case "nfet-ideal-diode":
      if (stage.controller.reverseRatingV === undefined) out["part.controllerReverseRatingV"] = "the controller states no reverse rating of its input pin (controller.reverseRatingV): its survival of the reversed supply is unproven";
      if (stage.mosfet.avalancheCurrentA === undefined) out["part.avalancheCurrentA"] = "the MOSFET states no avalanche current rating (mosfet.avalancheCurrentA)";
      break;
    case "pfet-high-side":
    case "nfet-low-side":
      if (stage.mosfet.avalancheCurrentA === undefined) out["part.avalancheCurrentA"] = "the MOSFET states no avalanche current rating (mosfet.avalancheCurrentA)";
      break;
    case "integrated-switch":
      if (stage.reverseRatingV === undefined) out["part.switchReverseRatingV"] = "the switch states no reverse rating (reverseRatingV): its reverse blocking is unproven";
      break;
    default:
      break;
  }
  return out;
}
