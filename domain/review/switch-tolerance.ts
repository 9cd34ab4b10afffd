import type { IntegratedSwitchStage, StageModel } from "../stages/stage-model.js";

/**
 * An integrated switch's protection thresholds at their datasheet extremes: the lowest current
 * limit, the lowest and highest overvoltage cut-off threshold (absent: the typical value).
 */
export interface SwitchTolerance {
  readonly currentLimitMinA?: number;
  readonly overvoltageCutoffMinV?: number;
  readonly overvoltageCutoffMaxV?: number;
}

/**
 * The stage with its current limit at the lowest value: the inrush's worst case (the charge time
 * C·V/(I_lim − I_load) is longest, the loss lasts longest). Other stages unchanged.
 */
export function atLowestCurrentLimit(stage: StageModel, tol: SwitchTolerance | undefined): StageModel {
  if (stage.kind !== "integrated-switch" || tol?.currentLimitMinA === undefined) return stage;
  return { ...stage, currentLimitA: tol.currentLimitMinA } satisfies IntegratedSwitchStage;
}

/**
 * The stage with its overvoltage cut-off at the highest threshold: what reaches the load through
 * a cut-off opens latest (load-overvoltage.ts). Other stages unchanged.
 */
export function atHighestCutoff(stage: StageModel, tol: SwitchTolerance | undefined): StageModel {
  if (stage.kind !== "integrated-switch" || tol?.overvoltageCutoffMaxV === undefined) return stage;
  return { ...stage, overvoltageCutoffV: tol.overvoltageCutoffMaxV } satisfies IntegratedSwitchStage;
}

/**
 * The limits the rules read: the lowest current limit (against the highest load current) and the
 * lowest cut-off threshold (against the highest steady supply), each the typical value where the
 * tolerance is not given; undefined where the stage has no such protection.
 */
export function switchRuleLimits(
  stage: StageModel,
  tol: SwitchTolerance | undefined,
): { readonly currentLimitA?: number; readonly overvoltageCutoffV?: number } {
  if (stage.kind !== "integrated-switch") return {};
  const limitA = stage.currentLimitA === undefined ? undefined : (tol?.currentLimitMinA ?? stage.currentLimitA);
  const cutoffV =
    stage.overvoltageCutoffV === undefined ? undefined : (tol?.overvoltageCutoffMinV ?? stage.overvoltageCutoffV);
  return {
    ...(limitA === undefined ? {} : { currentLimitA: limitA }),
    ...(cutoffV === undefined ? {} : { overvoltageCutoffV: cutoffV }),
  };
}
