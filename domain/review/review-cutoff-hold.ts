import { type CutoffHold, cutoffHold, type SteadyLevel } from "../checks/cutoff-hysteresis.js";
import type { LoadOvervoltage } from "../checks/load-overvoltage.js";
import type { StageModel } from "../stages/stage-model.js";
import type { ReviewRequirement } from "./candidate-review.js";

/**
 * An integrated switch's overvoltage cut-off with its hysteresis against the supply's steady
 * levels (its top, long-term overvoltage, jump start, abnormal limit), at the lowest threshold
 * (switch-tolerance.ts: switchRuleLimits): which of them keep the switch open after an excursion
 * (cutoff-hysteresis.ts). Undefined for a stage without a cut-off.
 */
export function reviewCutoffHold(
  req: Pick<ReviewRequirement, "supplyMaxV" | "longTermOvervoltageV" | "jumpStartV" | "abnormalMaxV">,
  stage: StageModel,
  limits: { readonly overvoltageCutoffV?: number },
  atLoad: LoadOvervoltage,
): CutoffHold | undefined {
  const thresholdV = limits.overvoltageCutoffV;
  if (stage.kind !== "integrated-switch" || thresholdV === undefined) return undefined;
  const levels: SteadyLevel[] = [{ level: "supply-max", levelV: req.supplyMaxV }];
  if (req.longTermOvervoltageV !== undefined)
    levels.push({ level: "long-term-overvoltage", levelV: req.longTermOvervoltageV });
  if (req.jumpStartV !== undefined) levels.push({ level: "jump-start", levelV: req.jumpStartV });
  if (req.abnormalMaxV !== undefined) levels.push({ level: "abnormal-max", levelV: req.abnormalMaxV });
  return cutoffHold(thresholdV, stage.overvoltageHysteresisV ?? 0, levels, atLoad.pulses);
}
