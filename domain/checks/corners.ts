import { totalRthKPerW } from "../physics/thermal-path.js";
import { type OperatingPointOutcome, solveThermalPoint, type ThermalPoint } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { scaleLoad } from "../solve/load-scale.js";
import { type StageScale, scaleStage } from "../stages/scale-stage.js";
import type { StageModel } from "../stages/stage-model.js";

export interface CornerConditions {
  readonly supply: "min" | "nominal" | "max";
  readonly supplyV: number;
  readonly ambient: "min" | "max";
  readonly ambientC: number;
  readonly loadScale: number;
  readonly tolerance: "typical" | "datasheet-max";
}

export interface CornerResult {
  readonly conditions: CornerConditions;
  /** The point without its loop gain: no corner check reads Rth·dP/dTj, so its probe is skipped. */
  readonly result: OperatingPointOutcome<ThermalPoint>;
}

export interface CornerSpace {
  readonly supplyMinV: number;
  readonly supplyNominalV: number;
  readonly supplyMaxV: number;
  readonly ambientMinC: number;
  readonly ambientMaxC: number;
  readonly loadScales: readonly number[];
  /** The datasheet-maximum tolerance corner; absent: typical values only. */
  readonly datasheetMax?: StageScale;
  readonly sourceResistanceOhm: number;
  readonly load: LoadModel;
}

/** Every combination of supply (min, nominal, max) × ambient (min, max) × load level × tolerance. */
export function cornerConditions(space: CornerSpace): CornerConditions[] {
  const out: CornerConditions[] = [];
  const supplies = [
    ["min", space.supplyMinV],
    ["nominal", space.supplyNominalV],
    ["max", space.supplyMaxV],
  ] as const;
  const ambients = [
    ["min", space.ambientMinC],
    ["max", space.ambientMaxC],
  ] as const;
  const tolerances = space.datasheetMax ? (["typical", "datasheet-max"] as const) : (["typical"] as const);
  for (const [supply, supplyV] of supplies)
    for (const [ambient, ambientC] of ambients)
      for (const loadScale of space.loadScales)
        for (const tolerance of tolerances) out.push({ supply, supplyV, ambient, ambientC, loadScale, tolerance });
  return out;
}

/** Solve the stage at every corner. */
export function solveCorners(stage: StageModel, space: CornerSpace): CornerResult[] {
  const maxStage = space.datasheetMax ? scaleStage(stage, space.datasheetMax) : stage;
  return cornerConditions(space).map((c) => {
    const s = c.tolerance === "typical" ? stage : maxStage;
    return {
      conditions: c,
      result: solveThermalPoint({
        stage: s,
        supplyV: c.supplyV,
        sourceResistanceOhm: space.sourceResistanceOhm,
        load: scaleLoad(space.load, c.loadScale),
        ambientC: c.ambientC,
        rthKPerW: totalRthKPerW(s.thermal),
      }),
    };
  });
}

export interface WorstOf {
  readonly value: number;
  readonly cornerIndex: number;
}

export interface WorstCase {
  readonly tjC?: WorstOf;
  readonly lossW?: WorstOf;
  readonly dropV?: WorstOf;
  readonly loadMinV?: WorstOf;
  /** Corners without an operating point (runaway, collapse, stage off), by index. */
  readonly unsolvedCornerIndexes: readonly number[];
}

/** The worst corner per metric, among the corners that have an operating point. */
export function worstCase(corners: readonly CornerResult[]): WorstCase {
  // Scalars while scanning (one record per metric at the end, not one per improvement).
  let tjI = -1;
  let lossI = -1;
  let dropI = -1;
  let loadI = -1;
  let tj = 0;
  let loss = 0;
  let drop = 0;
  let load = 0;
  const unsolved: number[] = [];
  for (let i = 0; i < corners.length; i += 1) {
    const r = (corners[i] as CornerResult).result;
    if (!("point" in r)) {
      unsolved.push(i);
      continue;
    }
    const p = r.point;
    if (tjI < 0 || p.tjC > tj) {
      tjI = i;
      tj = p.tjC;
    }
    if (lossI < 0 || p.dieLossW > loss) {
      lossI = i;
      loss = p.dieLossW;
    }
    if (dropI < 0 || p.forward.dropV > drop) {
      dropI = i;
      drop = p.forward.dropV;
    }
    if (loadI < 0 || p.loadV < load) {
      loadI = i;
      load = p.loadV;
    }
  }
  // Object.assign: a literal that opens with a spread and then gets fields is V8's slow path.
  return Object.assign(
    {},
    tjI < 0 ? {} : { tjC: { value: tj, cornerIndex: tjI } },
    lossI < 0 ? {} : { lossW: { value: loss, cornerIndex: lossI } },
    dropI < 0 ? {} : { dropV: { value: drop, cornerIndex: dropI } },
    loadI < 0 ? {} : { loadMinV: { value: load, cornerIndex: loadI } },
    { unsolvedCornerIndexes: unsolved },
  );
}
