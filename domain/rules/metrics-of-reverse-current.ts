import type { ChargingOutcome } from "../checks/battery-charging-types.js";
import type { HoldUpOutcome } from "../checks/hold-up.js";
import { blocksReverseCurrent } from "../checks/stage-ratings.js";
import type { TurnOffOutcome } from "../checks/turn-off-event.js";
import type { ElementRuleInput } from "./element-verdicts.js";
import type { RuleInput } from "./rule-model.js";
import type { OringOutcome } from "../solve/oring-network.js";
import type { LoadModel } from "../solve/load-model.js";
import type { StageModel } from "../stages/stage-model.js";
import {
  closeScope,
  draft,
  putEventAvalanche,
  putEventFigures,
  putOr,
  type RuleInputDraft,
} from "./rule-input-draft.js";
import { missingRatings, partParameters, stageMetrics } from "./metrics-of-operating-point.js";

type Caller = Readonly<Record<string, number | boolean>>;

/** The stage's own description: quiescent current, start voltage, whether it blocks reverse current. */
function stageDraft(stage: StageModel, caller: Caller): RuleInputDraft {
  const d = draft(stage.kind, caller, partParameters(stage));
  Object.assign(d.metrics, stageMetrics(stage), { blocksReverseCurrent: blocksReverseCurrent(stage) });
  Object.assign(d.unavailable, missingRatings(stage));
  return d;
}

function loadMinimum(d: RuleInputDraft, load: LoadModel, loadMinV?: number): void {
  if (loadMinV !== undefined) d.metrics["loadMinV"] = loadMinV;
  else if (load.kind === "constant-power") d.metrics["loadMinV"] = load.minVoltageV;
}

export const TURN_OFF_COMPUTES = [
  "peakReverseCurrentA",
  "absorbedEnergyJ",
  "eventTjC",
  "avalancheEnergyAtTjJ",
  "blocksReverseCurrent",
  "loadReverseVMaxV",
] as const;

/**
 * turnOff → rules: peakReverseCurrentA, absorbedEnergyJ (the clamp phase's Vcl·∫|i|dt; 0 when the
 * current is back at zero by turn-off, or when the stage never turns off and so never clamps),
 * eventTjC (the request's tjC), turnOffRepetitive (its repetitive), part.avalancheEnergyJ (the request's avalancheRatingJ, else the
 * stage's) and avalancheEnergyAtTjJ (that rating derated to eventTjC). Energy absorbed without a
 * rating is a gap in the evidence (unavailable), not out of scope: the element is stressed and
 * nothing says it survives.
 */
export function turnOffRuleInput(
  stage: StageModel,
  r: TurnOffOutcome,
  event: { readonly tjC: number; readonly repetitive: boolean; readonly loadReverseLimitV?: number | undefined },
  avalancheRatingJ: number | undefined,
  caller: Caller,
): RuleInput {
  const d = stageDraft(stage, caller);
  putEventAvalanche(
    stage,
    event,
    avalancheRatingJ,
    d,
    "the stage gives no avalanche energy rating: give avalancheRatingJ, or the part's avalancheEnergyJ",
  );
  putEventFigures(r, event.loadReverseLimitV, d);
  return closeScope(d, "turnOff");
}

export const HOLD_UP_COMPUTES = ["holdUpS", "holdUpRequiredS", "blocksReverseCurrent"] as const;

/**
 * holdUp → rules, per stage: holdUpS (0 when the output starts below the minimum), holdUpRequiredS
 * (requiredHoldUpS; out of scope when not given) and holdUpRequired (true when it is given, for
 * the reverse-current-blocking rule). An output that is never interrupted (the input after the
 * event keeps it up) has no finite hold-up: the hold-up rules are then out of scope with why.
 */
export function holdUpRuleInput(
  stage: StageModel,
  r: HoldUpOutcome,
  requiredS: number | undefined,
  caller: Caller,
): RuleInput {
  const d = stageDraft(stage, caller);
  if (requiredS !== undefined) {
    d.metrics["holdUpRequiredS"] = requiredS;
    if (!Object.hasOwn(d.metrics, "holdUpRequired")) d.metrics["holdUpRequired"] = true;
  } else d.notRequired["holdUpRequiredS"] = "requiredHoldUpS is not given";
  switch (r.outcome) {
    case "holds":
    case "drains-back":
      d.metrics["holdUpS"] = r.holdUpS;
      break;
    case "no-hold-up":
      d.metrics["holdUpS"] = 0;
      break;
    case "not-interrupted":
      d.notRequired["holdUpS"] = `the output is never interrupted: ${r.reason}`;
      break;
  }
  return closeScope(d, "holdUp");
}

export const ORING_COMPUTES = [
  "tjWorstC",
  "reverseCurrentA",
  "loadVMinV",
  "parallelSources",
  "blocksReverseCurrent",
] as const;

/**
 * oring → rules, one element per branch (named by the source's name, else "sources[k]"): the
 * branch's stage kind and part, tjWorstC = its junction, reverseCurrentA = current flowing back
 * into its source, and shared by all: loadVMinV = node voltage, parallelSources = more than one
 * source. Without a solution those are unavailable with the network's outcome.
 */
export function oringElementInputs(
  stages: readonly StageModel[],
  names: readonly (string | undefined)[],
  load: LoadModel,
  r: OringOutcome,
  caller: Caller,
): ElementRuleInput[] {
  return stages.map((stage, k) => {
    const d = stageDraft(stage, caller);
    d.metrics["parallelSources"] = stages.length > 1;
    loadMinimum(d, load);
    const b = r.outcome === "solved" ? r.branches[k] : undefined;
    const why = r.outcome === "solved" ? "internal: branch missing" : `no network solution (${r.outcome}: ${r.reason})`;
    putOr(d, "tjWorstC", b?.tjC, why);
    putOr(d, "reverseCurrentA", b === undefined ? undefined : Math.max(0, -b.currentA), why);
    putOr(d, "loadVMinV", r.outcome === "solved" ? r.nodeV : undefined, why);
    return { element: names[k] ?? `sources[${k}]`, input: closeScope(d, "oring") };
  });
}

export const CHARGE_COMPUTES = ["tjWorstC", "targetCanDrainSource", "blocksReverseCurrent"] as const;

/**
 * batteryCharge → rules, per stage: targetCanDrainSource (the reverse check with the source
 * flat) and tjWorstC = the peak junction over the charge. When no charge current flows the
 * junction stays at ambient: its rules are out of scope; a failed integration is a gap.
 */
export function batteryChargeRuleInput(stage: StageModel, r: ChargingOutcome, caller: Caller): RuleInput {
  const d = stageDraft(stage, caller);
  switch (r.outcome) {
    case "charged":
      d.metrics["targetCanDrainSource"] = !r.reverse.blocks;
      d.metrics["tjWorstC"] = r.peakStageTjC;
      break;
    case "no-charge":
      d.metrics["targetCanDrainSource"] = !r.reverse.blocks;
      d.notRequired["tjWorstC"] = `no charge current flows: ${r.reason}`;
      break;
    case "integration-failed":
    case "thermal-runaway":
      d.unavailable["targetCanDrainSource"] = `${r.outcome}: ${r.reason}`;
      d.unavailable["tjWorstC"] = `${r.outcome}: ${r.reason}`;
      break;
  }
  return closeScope(d, "batteryCharge");
}
