import { type CornerResult, cornerThermal } from "../checks/corners.js";
import { type ThermalSizing, thermalSizing } from "../checks/thermal-sizing.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import { scaleLoad } from "../solve/load-scale.js";
import { type StageModel, stageTjMaxC } from "../stages/stage-model.js";
import type { ReviewCandidate, ReviewRequirement } from "./candidate-review.js";
import { atLowestCurrentLimit } from "./switch-tolerance.js";

/**
 * Thermal sizing at the hot, full-load corner with the datasheet-maximum part (sizingStage), at
 * the supply whose corner ran hottest (every supply when none of those corners has a point). An
 * integrated switch with a minimum current limit is sized at both limits: the limiting dissipation
 * (V_in − I_lim·R)·I_lim is not monotonic in I_lim, and thermalSizing holds the junction at every
 * condition given.
 */
export function reviewThermalSizing(
  req: ReviewRequirement,
  cand: ReviewCandidate,
  corners: readonly CornerResult[],
  sizingStage: StageModel,
  fullScale: number,
): ThermalSizing {
  const hotTolerance = cand.datasheetMax ? "datasheet-max" : "typical";
  let hottest: { supplyV: number; tjC: number } | undefined;
  for (const c of corners) {
    const k = c.conditions;
    const th = cornerThermal(c);
    if (k.ambient !== "max" || k.loadScale !== fullScale || k.tolerance !== hotTolerance || !("point" in th)) continue;
    if (hottest === undefined || th.point.tjC > hottest.tjC) hottest = { supplyV: k.supplyV, tjC: th.point.tjC };
  }
  const minLimitStage = atLowestCurrentLimit(sizingStage, cand.switchTolerance);
  const stages = minLimitStage === sizingStage ? [sizingStage] : [sizingStage, minLimitStage];
  const supplies = hottest ? [hottest.supplyV] : [req.supplyMinV, req.supplyNominalV, req.supplyMaxV];
  return thermalSizing(
    supplies.flatMap((supplyV) =>
      stages.map((stage) => ({
        supplyV,
        ambientC: req.ambientMaxC,
        load: scaleLoad(req.load, fullScale),
        sourceResistanceOhm: req.sourceResistanceOhm,
        stage,
      })),
    ),
    cand.stage.thermal,
    totalRthKPerW(cand.stage.thermal),
    stageTjMaxC(cand.stage) - req.tjMarginK,
  );
}
