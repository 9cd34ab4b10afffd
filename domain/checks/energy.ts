import { totalRthKPerW } from "../physics/thermal-path.js";
import { solveOperatingPoint } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { scaleLoad } from "../solve/load-scale.js";
import { controllerLossW } from "../stages/stage-behaviours.js";
import { type StageModel, stageQuiescentA } from "../stages/stage-model.js";

export interface MissionRow {
  readonly hoursPerYear: number;
  readonly loadScale: number;
  readonly ambientC: number;
}

export interface MissionEnergy {
  readonly lossEnergyKWhPerYear: number;
  readonly costPerYear?: number;
  /** Rows without an operating point contribute nothing and are listed here by index. */
  readonly unsolvedRows: readonly number[];
}

/** Loss energy over a mission profile: Σ P(row)·hours, each row solved electrothermally at the nominal supply. */
export function missionEnergy(
  stage: StageModel,
  rows: readonly MissionRow[],
  supplyV: number,
  sourceResistanceOhm: number,
  load: LoadModel,
  pricePerKWh?: number,
): MissionEnergy {
  let wh = 0;
  const unsolved: number[] = [];
  rows.forEach((row, i) => {
    const r = solveOperatingPoint({
      stage,
      supplyV,
      sourceResistanceOhm,
      load: scaleLoad(load, row.loadScale),
      ambientC: row.ambientC,
      rthKPerW: totalRthKPerW(stage.thermal),
    });
    // A separate controller's quiescent power counts too (an integrated switch's is in its die
    // loss), at the voltage across it: the stage input, not the open-circuit supply.
    if ("point" in r) wh += (r.point.dieLossW + controllerLossW(stage, r.point.stageInputV)) * row.hoursPerYear;
    else unsolved.push(i);
  });
  const kwh = wh / 1000;
  return {
    lossEnergyKWhPerYear: kwh,
    ...(pricePerKWh === undefined ? {} : { costPerYear: kwh * pricePerKWh }),
    unsolvedRows: unsolved,
  };
}

export interface StandbyDrain {
  readonly stageQuiescentA: number;
  readonly totalStandbyA: number;
  readonly stageChargePerDayAh: number;
  readonly totalChargePerDayAh: number;
  /** Days until the battery's usable charge is drawn, by the standby total; absent without a battery. */
  readonly daysToDrain?: number;
}

/** Quiescent current as charge per day and the days to drain a battery to its usable depth. */
export function standbyDrain(
  stage: StageModel,
  loadStandbyA: number,
  battery?: { capacityAh: number; usableFraction: number },
): StandbyDrain {
  const iq = stageQuiescentA(stage);
  const total = iq + loadStandbyA;
  return {
    stageQuiescentA: iq,
    totalStandbyA: total,
    stageChargePerDayAh: iq * 24,
    totalChargePerDayAh: total * 24,
    ...(battery && total > 0 ? { daysToDrain: (battery.capacityAh * battery.usableFraction) / (total * 24) } : {}),
  };
}
