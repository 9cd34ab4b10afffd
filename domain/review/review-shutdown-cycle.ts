import { type CornerResult, cornerThermal } from "../checks/corners.js";
import { type ShutdownCycle, shutdownCycle } from "../checks/shutdown-cycle.js";
import type { TransientThermal } from "../checks/start-up.js";
import type { StageModel } from "../stages/stage-model.js";

export interface ReviewShutdownCycle {
  /** The corner the cycle is computed at: the hottest whose steady Tj reaches the shutdown. */
  readonly corner: number;
  readonly ambientC: number;
  readonly cycle: ShutdownCycle;
}

/**
 * An auto-retrying integrated switch at the hottest steady corner that reaches its thermal
 * shutdown: the cycle between shutdown and shutdown − hysteresis (shutdown-cycle.ts) at the
 * corner's dissipation, through the candidate's Foster network where it has one, else the single
 * pole of the corner's own steady rise (Tj − Ta)/P (the duty only: the steady path has no time
 * constant). The loss is held at the corner's steady figure (at the current limit it does not
 * depend on Tj). Undefined for a latched part, one without a shutdown, or where no solved corner
 * reaches it (a corner in runaway has no loss to cycle at).
 */
export function reviewShutdownCycle(
  stage: StageModel,
  corners: readonly CornerResult[],
  transientThermal: TransientThermal,
): ReviewShutdownCycle | undefined {
  if (stage.kind !== "integrated-switch" || stage.thermalShutdownC === undefined) return undefined;
  const after = stage.afterThermalShutdown;
  if (after?.mode !== "auto-retry") return undefined;
  const shutdownC = stage.thermalShutdownC;
  let hottest: { i: number; ambientC: number; tjC: number; lossW: number } | undefined;
  for (const [i, c] of corners.entries()) {
    const th = cornerThermal(c);
    if (!("point" in th)) continue;
    const p = th.point;
    if (p.forward.mode === "body-diode" || p.forward.mode === "junction" || p.tjC < shutdownC || p.dieLossW <= 0)
      continue;
    if (hottest === undefined || p.tjC > hottest.tjC)
      hottest = { i, ambientC: c.conditions.ambientC, tjC: p.tjC, lossW: p.dieLossW };
  }
  if (hottest === undefined) return undefined;
  const thermal =
    transientThermal.kind === "foster"
      ? { foster: transientThermal.terms }
      : { rthKPerW: (hottest.tjC - hottest.ambientC) / hottest.lossW };
  return {
    corner: hottest.i,
    ambientC: hottest.ambientC,
    cycle: shutdownCycle(hottest.lossW, hottest.ambientC, shutdownC, after.hysteresisK, thermal),
  };
}
