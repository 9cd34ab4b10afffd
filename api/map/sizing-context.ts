import type { Requirement } from "../../contracts/requirement.js";
import type { StageSpec } from "../../contracts/stage.js";
import { inputFallIssues } from "../../contracts/turn-off.js";
import { inputProblem } from "../input-problem.js";
import { reviewCandidate } from "../../domain/review/candidate-review.js";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import type { SizingContext, TurnOffSizing } from "../../domain/sizing/assessment.js";
import type { StageScale } from "../../domain/stages/scale-stage.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import {
  type DatasheetMaxSpec,
  datasheetMaxScale,
  noteThresholdCorners,
  switchTolerance,
  thresholdMinShiftV,
  worstTurnOffTiming,
} from "./datasheet-max.js";
import type { MappedRequirement } from "./requirement.js";
import { reviewRuleInput } from "../../domain/rules/metrics-of-review.js";
import { type TransientThermalInput, transientThermalOf } from "./transient-thermal.js";

export interface TurnOffRequest {
  loop: { resistanceOhm: number; inductanceH: number };
  capacitor: { capacitanceF: number; esrOhm: number };
  outputV?: number | undefined;
  inputAfterV?: number | undefined;
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
  cand: { transientThermal?: TransientThermalInput; datasheetMax?: DatasheetMaxSpec | undefined },
  turnOff: TurnOffRequest | undefined,
  path: (string | number)[] = [],
  assumptions: string[] = [],
): SizingContext {
  const flags = {
    parallelSources: r.parallelSources ?? false,
    holdUpRequired: r.holdUpRequired ?? false,
    ...(r.standbyBudgetA === undefined ? {} : { standbyBudgetA: r.standbyBudgetA }),
    ...(r.lossBudgetW === undefined ? {} : { lossBudgetW: r.lossBudgetW }),
  };
  const { mission: _mission, ...searchReq } = req.model;
  const transientThermal = transientThermalOf(
    cand.transientThermal,
    stage.model,
    [...path, "transientThermal"],
    assumptions,
  );
  const datasheetMax: StageScale | undefined = cand.datasheetMax
    ? datasheetMaxScale(cand.datasheetMax, stage.model, [...path, "datasheetMax"])
    : undefined;
  const label = path.length > 0 ? path.join(".") : `part ${stage.partId ?? stage.spec.name ?? stage.model.kind}`;
  noteThresholdCorners(stage.model, cand.datasheetMax, req.model.ambientMinC, label, assumptions);
  const switchTol = switchTolerance(cand.datasheetMax, stage.model, [...path, "datasheetMax"], assumptions);
  const assess = (s: StageModel) => {
    const review = reviewCandidate(searchReq, {
      stage: s,
      transientThermal,
      ...(datasheetMax ? { datasheetMax } : {}),
      ...(switchTol ? { switchTolerance: switchTol } : {}),
    });
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
  const outputV = t.outputV ?? req.model.supplyNominalV;
  const [fall] = inputFallIssues(
    { outputV, inputAfterV: t.inputAfterV ?? 0 },
    t.outputV === undefined ? "the nominal supply" : "turnOff.outputV",
  );
  if (fall !== undefined) throw inputProblem("invalid-input", ["turnOff", ...fall.path], fall.message);
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
    outputV,
    inputAfterV: t.inputAfterV ?? 0,
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
