import { behaviourOf } from "../stages/stage-behaviours.js";
import { blocksReverseCurrent } from "../checks/stage-ratings.js";
import type { RuleInput } from "./rule-model.js";
import type { OperatingPointOutcome } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { type StageModel, stageQuiescentA, stageStartV, stageTjMaxC } from "../stages/stage-model.js";
import { otherAnalysesMetrics } from "./rule-input-draft.js";

/** Metrics the operating point computes; a caller may not supply them alongside it. */
export const OPERATING_POINT_METRICS = [
  "tjWorstC",
  "lossWorstW",
  "dropWorstV",
  "loadVMinV",
  "gateDriveMinV",
  "startChatter",
] as const;

/**
 * Map an operating point, its stage and its load to rule metrics. The point is taken as the worst
 * corner the caller chose (lowest supply, highest current and ambient): tjWorstC = Tj,
 * lossWorstW = heat in the die, dropWorstV = forward drop, loadVMinV = load voltage,
 * gateDriveMinV = gate-source drive at this supply, startChatter = the point lies in the start
 * threshold's chatter band (a stage with a start voltage). Without a point (runaway, collapse, stage
 * off) those names are marked unavailable with the outcome, so their rules are not applicable
 * and the set's outcome is at best "incomplete", never "pass".
 */
export function operatingPointRuleInput(
  stage: StageModel,
  load: LoadModel,
  o: OperatingPointOutcome,
  callerMetrics: Readonly<Record<string, number | boolean>>,
): RuleInput {
  const metrics: Record<string, number | boolean> = { ...callerMetrics, ...stageMetrics(stage) };
  if (load.kind === "constant-power") metrics["loadMinV"] = load.minVoltageV;
  const unavailable: Record<string, string> = {};
  if (o.outcome === "solved" || o.outcome === "over-temperature" || o.outcome === "load-undervoltage") {
    const p = o.point;
    metrics["tjWorstC"] = p.tjC;
    metrics["lossWorstW"] = p.dieLossW;
    metrics["dropWorstV"] = p.forward.dropV;
    metrics["loadVMinV"] = p.loadV;
    if (p.forward.gateSourceV !== undefined && behaviourOf(stage).gateDriveMetric) {
      metrics["gateDriveMinV"] = p.forward.gateSourceV;
    }
    // A stage with a start voltage: whether this supply lies in the start threshold's chatter band.
    if (stageStartV(stage) !== undefined) metrics["startChatter"] = p.startChatter !== undefined;
  } else {
    for (const n of OPERATING_POINT_METRICS) unavailable[n] = `no operating point (${o.outcome}: ${o.reason})`;
  }
  return {
    stageKind: stage.kind,
    metrics,
    part: partParameters(stage),
    unavailable,
    notRequired: otherAnalysesMetrics(metrics, "operatingPoint"),
  };
}

export function stageMetrics(stage: StageModel): Record<string, number | boolean> {
  // Whether the stage turns off on reverse current comes from one place (stage-ratings.ts).
  const m: Record<string, number | boolean> = {
    quiescentA: stageQuiescentA(stage),
    blocksReverseCurrent: blocksReverseCurrent(stage),
  };
  return Object.assign(m, behaviourOf(stage).describe(stage).metrics);
}

/** The part's ratings by vocabulary name: tjMaxC and what its kind states (domain/stages/). */
export function partParameters(stage: StageModel): Record<string, number> {
  const part: Record<string, number> = { tjMaxC: stageTjMaxC(stage) };
  return Object.assign(part, behaviourOf(stage).describe(stage).part);
}

/**
 * Part ratings the stage does not state that a stress of the design review or the turn-off event
 * is compared with: the rule is then a gap (it cannot pass), with why.
 */
export function missingRatings(stage: StageModel): Record<string, string> {
  return behaviourOf(stage).describe(stage).missing;
}
