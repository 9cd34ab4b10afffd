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
  "thermalShutdownInService",
] as const;

/**
 * Map an operating point, its stage and its load to rule metrics. The point is taken as the worst
 * corner the caller chose (lowest supply, highest current and ambient): tjWorstC = Tj,
 * lossWorstW = heat in the die, dropWorstV = forward drop, loadVMinV = load voltage,
 * gateDriveMinV = gate-source drive at this supply, startChatter = the point lies in the start
 * threshold's chatter band (a stage with a start voltage), thermalShutdownInService = an integrated
 * switch's Tj at or above its thermal shutdown (thermal runaway counts where the search passes
 * it; the switch then off, taken as latched). Without a point (runaway, collapse, stage
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
  const notRequired: Record<string, string> = {};
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
    for (const n of OPERATING_POINT_METRICS)
      if (n !== "thermalShutdownInService") unavailable[n] = `no operating point (${o.outcome}: ${o.reason})`;
  }
  const shutdown = thermalShutdownAt(stage, o);
  if (typeof shutdown === "boolean") metrics["thermalShutdownInService"] = shutdown;
  else if (shutdown.unavailable) unavailable["thermalShutdownInService"] = shutdown.why;
  else notRequired["thermalShutdownInService"] = shutdown.why;
  return {
    stageKind: stage.kind,
    metrics,
    part: partParameters(stage),
    unavailable,
    notRequired: { ...otherAnalysesMetrics(metrics, "operatingPoint"), ...notRequired },
  };
}

/** Whether the point heats an integrated switch to its thermal shutdown, or why that is not said. */
function thermalShutdownAt(
  stage: StageModel,
  o: OperatingPointOutcome,
): boolean | { readonly unavailable: boolean; readonly why: string } {
  const shutdownC = stage.kind === "integrated-switch" ? stage.thermalShutdownC : undefined;
  if (shutdownC === undefined) return { unavailable: false, why: "the stage states no thermal shutdown temperature" };
  if ("point" in o) {
    const mode = o.point.forward.mode;
    return mode !== "body-diode" && mode !== "junction" && o.point.tjC >= shutdownC;
  }
  if (o.outcome === "stage-off") return false;
  if (o.outcome === "thermal-runaway" && o.evidence.searchedToC >= shutdownC) return true;
  return { unavailable: true, why: `no operating point (${o.outcome}: ${o.reason})` };
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
