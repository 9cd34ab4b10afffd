import type { Requirement } from "../../contracts/requirement.js";
import type { StageSpec } from "../../contracts/stage.js";
import type { ReviewCandidate } from "../../domain/review/candidate-review.js";
import { transientAllowanceOf } from "../../domain/review/transient-allowance.js";
import type { CompiledRuleSet } from "../../domain/rules/compile-rule-set.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import {
  type DatasheetMaxSpec,
  datasheetMaxScale,
  switchTolerance,
  thresholdMinShiftV,
  worstTurnOffTiming,
} from "./datasheet-max.js";
import type { MappedRequirement } from "./requirement.js";
import { inputProblem } from "../input-problem.js";
import { pairInrushAssumption } from "./inrush-requirement.js";
import { controllerTimingOf, MISSING_TIMING } from "./reverse-inputs.js";
import { type TransientThermalInput, transientThermalOf } from "./transient-thermal.js";

/** What a candidate (or a sizing template, or a catalog part) adds to its stage for the review. */
export interface CandidateInputs {
  readonly transientThermal?: TransientThermalInput | undefined;
  readonly datasheetMax?: DatasheetMaxSpec | undefined;
  readonly turnOffTiming?:
    | {
        reverseThresholdV: number;
        turnOffDelayS: number;
        gateChargeC?: number | undefined;
        gateSinkCurrentA?: number | undefined;
      }
    | undefined;
}

/**
 * The one formation of a review candidate from a part (the review procedure's, and sizing's so that
 * a sized part is reviewed exactly as the review reviews it): its transient thermal network, its
 * datasheet-maximum corner as a stage scale, the turn-off timing for the requirement's turn-off
 * event (the candidate's, else requirement.turnOff.timing, else the stage controller's; at the
 * datasheet maximum where given), an integrated switch's tolerances, the datasheet-minimum gate
 * threshold for the event, and the transient allowances the rule set grants (unless the
 * requirement sets its own derating). `path` is the candidate's (e.g. ["candidates", 0]). A stage
 * that turns off on reverse current without a timing is refused, naming the field, or with
 * `"report"` (sizing a catalog) answered as `timingMissing`, its requirement's event not formed.
 */
export function reviewCandidateInputs(
  r: Requirement,
  req: MappedRequirement,
  set: CompiledRuleSet,
  stage: { spec: StageSpec; model: StageModel },
  c: CandidateInputs,
  path: (string | number)[],
  assumptions: string[],
  missingTiming: "refuse" | "report" = "refuse",
): { candidate: Omit<ReviewCandidate, "stage">; timingMissing?: { path: (string | number)[]; reason: string } } {
  const transientThermal = transientThermalOf(
    c.transientThermal,
    stage.model,
    [...path, "transientThermal"],
    assumptions,
  );
  if (stage.model.kind === "nfet-back-to-back" && req.model.inrush) assumptions.push(pairInrushAssumption(path));
  const dmPath = [...path, "datasheetMax"];
  const datasheetMax = c.datasheetMax ? datasheetMaxScale(c.datasheetMax, stage.model, dmPath, assumptions) : undefined;
  const timingPath = c.turnOffTiming ? [...path, "turnOffTiming"] : ["requirement", "turnOff", "timing"];
  const timing = req.model.turnOff
    ? controllerTimingOf(stage.spec, stage.model, c.turnOffTiming ?? r.turnOff?.timing, timingPath, assumptions)
    : undefined;
  if (timing === "missing" && missingTiming === "refuse")
    throw inputProblem("invalid-input", timingPath, MISSING_TIMING);
  const typicalTiming = timing === "missing" ? undefined : timing;
  const turnOffController = worstTurnOffTiming(typicalTiming, c.datasheetMax, dmPath, assumptions);
  const switchTol = switchTolerance(c.datasheetMax, stage.model, dmPath, assumptions);
  const turnOffThresholdShiftV = c.datasheetMax ? thresholdMinShiftV(c.datasheetMax, stage.model, dmPath) : 0;
  // Unless the requirement sets its own derating, the clamp window follows the rule set.
  const transientAllowanceV =
    r.deratingFactor === undefined ? transientAllowanceOf(set, stage.model, req.model) : undefined;
  const candidate = {
    transientThermal,
    ...(transientAllowanceV ? { transientAllowanceV } : {}),
    ...(datasheetMax ? { datasheetMax } : {}),
    ...(turnOffController ? { turnOffController } : {}),
    ...(turnOffThresholdShiftV === 0 ? {} : { turnOffThresholdShiftV }),
    ...(switchTol ? { switchTolerance: switchTol } : {}),
  };
  return timing === "missing"
    ? { candidate, timingMissing: { path: timingPath, reason: MISSING_TIMING } }
    : { candidate };
}
