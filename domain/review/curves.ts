import type { CornerConditions, CornerResult, WorstCase } from "../checks/corners.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import { type OperatingPointOutcome, solveOperatingPoint } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { scaleLoad } from "../solve/load-scale.js";
import { type StageScale, scaleStage } from "../stages/scale-stage.js";
import type { StageModel } from "../stages/stage-model.js";

/** Where the review's curves are drawn: one corner's supply, tolerance, ambient and load level. */
export interface CurveConditions extends CornerConditions {
  /** Which corner the curves pass through and why. */
  readonly basis: "worst-tj-corner" | "lowest-supply-hot-full-load";
}

export interface LoadCurvePoint {
  readonly loadScale: number;
  readonly result: OperatingPointOutcome;
}

export interface AmbientCurvePoint {
  readonly ambientC: number;
  readonly result: OperatingPointOutcome;
}

export interface ReviewCurves {
  readonly conditions: CurveConditions;
  /** Load level swept at the conditions' supply, ambient and tolerance. */
  readonly load: readonly LoadCurvePoint[];
  /** Ambient swept from the requirement's lowest to highest at the conditions' supply, load and tolerance. */
  readonly ambient: readonly AmbientCurvePoint[];
}

export interface CurveSpace {
  readonly supplyMinV: number;
  readonly ambientMinC: number;
  readonly ambientMaxC: number;
  readonly loadScales: readonly number[];
  readonly sourceResistanceOhm: number;
  readonly load: LoadModel;
  readonly datasheetMax?: StageScale;
}

/** Load levels of the sweep: 0.05, 0.1 … 1.2 of the highest level, plus every requirement level. */
export function curveLoadLevels(loadScales: readonly number[]): number[] {
  const full = Math.max(...loadScales);
  const grid = [0.05, ...Array.from({ length: 12 }, (_, i) => (i + 1) / 10)].map((f) => f * full);
  return [...new Set([...grid, ...loadScales].map((s) => Number(s.toPrecision(12))))].sort((a, b) => a - b);
}

/** Ambients of the sweep: the requirement's range in ten equal steps, ends included. */
export function curveAmbients(ambientMinC: number, ambientMaxC: number, steps = 10): number[] {
  return Array.from({ length: steps + 1 }, (_, i) => ambientMinC + ((ambientMaxC - ambientMinC) * i) / steps);
}

/**
 * Forward drop, loss and junction temperature against load level and against ambient, each point
 * the same steady electrothermal solve as a corner (domain/solve/electrothermal-point.ts), so the
 * curves pass exactly through the corner they are drawn at: the worst junction-temperature corner,
 * or, where no corner solved, the lowest supply at the hottest ambient and full load (datasheet
 * maximum where given). Pure; deterministic.
 */
export function reviewCurves(
  stage: StageModel,
  space: CurveSpace,
  corners: readonly CornerResult[],
  worst: WorstCase,
): ReviewCurves {
  const full = Math.max(...space.loadScales);
  const worstCorner = worst.tjC === undefined ? undefined : corners[worst.tjC.cornerIndex];
  const conditions: CurveConditions = worstCorner
    ? { ...worstCorner.conditions, basis: "worst-tj-corner" }
    : {
        supply: "min",
        supplyV: space.supplyMinV,
        ambient: "max",
        ambientC: space.ambientMaxC,
        loadScale: full,
        tolerance: space.datasheetMax ? "datasheet-max" : "typical",
        basis: "lowest-supply-hot-full-load",
      };
  const s =
    conditions.tolerance === "datasheet-max" && space.datasheetMax ? scaleStage(stage, space.datasheetMax) : stage;
  const rthKPerW = totalRthKPerW(s.thermal);
  const solve = (loadScale: number, ambientC: number) =>
    solveOperatingPoint({
      stage: s,
      supplyV: conditions.supplyV,
      sourceResistanceOhm: space.sourceResistanceOhm,
      load: scaleLoad(space.load, loadScale),
      ambientC,
      rthKPerW,
    });
  return {
    conditions,
    load: curveLoadLevels(space.loadScales).map((loadScale) => ({
      loadScale,
      result: solve(loadScale, conditions.ambientC),
    })),
    ambient: curveAmbients(space.ambientMinC, space.ambientMaxC).map((ambientC) => ({
      ambientC,
      result: solve(conditions.loadScale, ambientC),
    })),
  };
}
