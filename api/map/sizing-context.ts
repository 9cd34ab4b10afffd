import type { Requirement } from "../../contracts/requirement.js";
import type { StageSpec } from "../../contracts/stage.js";
import { reviewCandidate } from "../../domain/review/candidate-review.js";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import type { SizingContext, TurnOffSizing } from "../../domain/sizing/assessment.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import {
  type DatasheetMaxSpec,
  noteThresholdCorners,
  thresholdMinShiftV,
  worstTurnOffTiming,
} from "./datasheet-max.js";
import type { MappedRequirement } from "./requirement.js";
import { reviewRuleInput } from "../../domain/rules/metrics-of-review.js";
import { type CandidateInputs, reviewCandidateInputs } from "./review-candidate.js";
import { fallingInputOf } from "./turn-off-requirement.js";

export interface TurnOffRequest {
  loop: { resistanceOhm: number; inductanceH: number };
  capacitor: { capacitanceF: number; esrOhm: number };
  outputV?: number | undefined;
  inputAfterV?: number | undefined;
  inputDecay?: { startV: number; timeConstantS: number } | undefined;
  tjC?: number | undefined;
  reverseThresholdV?: number | undefined;
  gateChargeC?: number | undefined;
  gateSinkCurrentA?: number | undefined;
  clampV?: number | undefined;
  peakReverseCurrentMaxA?: number | undefined;
  absorbedEnergyMaxJ?: number | undefined;
}

/**
 * The sizing context of one template: the review of any trial part exactly as the review
 * procedure forms it (reviewCandidate + reviewRuleInput, mission energy left out: no rule reads
 * it), the rule set, and the turn-off event with the template's trip threshold. With a datasheet
 * maximum, the event and the template's own delay are at the maximum timing (worstTurnOffTiming,
 * as the review takes them) and the datasheet-minimum gate threshold (thresholdMinShiftV): the
 * candidate check compares the maximum delay with the limit. The threshold corners are said in
 * `assumptions` (noteThresholdCorners).
 */
export function sizingContext(
  r: Requirement,
  req: MappedRequirement,
  set: CompiledRuleSet,
  stage: { spec: StageSpec; model: StageModel; partId?: string | undefined },
  cand: CandidateInputs,
  turnOff: TurnOffRequest | undefined,
  path: (string | number)[] = [],
  assumptions: string[] = [],
  missingTiming: "refuse" | "report" = "refuse",
): SizingContext {
  const flags = {
    parallelSources: r.parallelSources ?? false,
    holdUpRequired: r.holdUpRequired ?? false,
    ...(r.standbyBudgetA === undefined ? {} : { standbyBudgetA: r.standbyBudgetA }),
    ...(r.lossBudgetW === undefined ? {} : { lossBudgetW: r.lossBudgetW }),
  };
  const { mission: _mission, ...searchReq } = req.model;
  const label = path.length > 0 ? path.join(".") : `part ${stage.partId ?? stage.spec.name ?? stage.model.kind}`;
  // The part formed exactly as the review forms a candidate (its trial variants share it). A
  // catalog part without a turn-off timing is reviewed without the requirement's event, and its
  // event line says why (the review refuses such a candidate, naming the field).
  const formed = reviewCandidateInputs(r, req, set, stage, cand, path, assumptions, missingTiming);
  const inputs = formed.candidate;
  const { turnOff: _event, ...withoutEvent } = searchReq;
  const reviewed = formed.timingMissing === undefined ? searchReq : withoutEvent;
  noteThresholdCorners(stage.model, cand.datasheetMax, req.model.ambientMinC, label, assumptions);
  const assess = (s: StageModel) => {
    const review = reviewCandidate(reviewed, { stage: s, ...inputs });
    return { review, input: reviewRuleInput(s, req.model, flags, review) };
  };
  const t =
    turnOff === undefined
      ? undefined
      : turnOffSizing(r, req, stage, turnOff, cand.datasheetMax, [...path, "datasheetMax"], assumptions);
  return {
    requirement: req.model,
    ruleSet: set,
    assess,
    ...(r.lossBudgetW === undefined ? {} : { lossBudgetW: r.lossBudgetW }),
    ...(t === undefined ? {} : typeof t === "string" ? { turnOffUnavailable: t } : { turnOff: t }),
    ...(formed.timingMissing === undefined
      ? {}
      : {
          eventUnavailable: `the requirement's turn-off event needs this part's reverse turn-off timing: ${formed.timingMissing.reason} (at ${formed.timingMissing.path.join(".")})`,
        }),
  };
}

function turnOffSizing(
  r: Requirement,
  req: MappedRequirement,
  stage: { spec: StageSpec; model: StageModel },
  t: TurnOffRequest,
  dm: DatasheetMaxSpec | undefined,
  path: (string | number)[],
  assumptions: string[],
): TurnOffSizing | string {
  const spec = stage.spec;
  const own = "controller" in spec ? spec.controller : undefined;
  // The event at the datasheet-minimum gate threshold, as the review takes it (thresholdMinShiftV).
  const thresholdShiftV = dm ? thresholdMinShiftV(dm, stage.model, path) : 0;
  const threshold = t.reverseThresholdV ?? own?.reverseThresholdV;
  if (threshold === undefined) return "the part states no reverse trip threshold: give turnOff.reverseThresholdV";
  const typicalDelayS = own?.turnOffDelayS;
  const worst = worstTurnOffTiming(
    { reverseThresholdV: threshold, turnOffDelayS: typicalDelayS ?? 0 },
    dm,
    path,
    assumptions,
  );
  const templateDelayS =
    typicalDelayS === undefined && dm?.turnOffDelayS === undefined ? undefined : worst?.turnOffDelayS;
  return {
    loopResistanceOhm: t.loop.resistanceOhm,
    loopInductanceH: t.loop.inductanceH,
    capacitanceF: t.capacitor.capacitanceF,
    esrOhm: t.capacitor.esrOhm,
    ...fallingInputOf(t, req.model.supplyNominalV, ["turnOff"], assumptions),
    loadMinV: req.model.loadMinV ?? 0,
    tjC: t.tjC ?? r.ambient.maxC,
    timing: {
      reverseThresholdV: worst?.reverseThresholdV ?? threshold,
      turnOffDelayS: worst?.turnOffDelayS ?? 0,
      ...(t.gateChargeC === undefined ? {} : { gateChargeC: t.gateChargeC }),
      ...(t.gateSinkCurrentA === undefined ? {} : { gateSinkCurrentA: t.gateSinkCurrentA }),
    },
    ...(thresholdShiftV === 0 ? {} : { thresholdShiftV }),
    ...(templateDelayS === undefined ? {} : { templateDelayS }),
    ...(t.clampV === undefined ? {} : { clampV: t.clampV }),
    ...(t.peakReverseCurrentMaxA === undefined ? {} : { peakReverseCurrentMaxA: t.peakReverseCurrentMaxA }),
    ...(t.absorbedEnergyMaxJ === undefined ? {} : { absorbedEnergyMaxJ: t.absorbedEnergyMaxJ }),
  };
}
