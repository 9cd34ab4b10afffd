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
  /**
   * The point without its loop gain: no corner check reads Rth·dP/dTj, so its probe is skipped.
   * An integrated switch with a datasheet minimum current limit is solved at that minimum here:
   * the load's supply (I_lim·R) and a collapse are worst at the lowest limit.
   */
  readonly result: OperatingPointOutcome<ThermalPoint>;
  /**
   * The same corner at the switch's typical current limit, where that heats the die more than the
   * minimum (hotter point, or a runaway against a point): the limiting dissipation
   * (V_in − I_lim·R)·I_lim peaks at I_lim = V_in/(2R), so it is not monotonic in I_lim. The
   * corner's Tj and loss are this one's (cornerThermal); absent where the minimum is the hotter.
   */
  readonly hotterAtLimit?: { readonly currentLimitA: number; readonly result: OperatingPointOutcome<ThermalPoint> };
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
  /** An integrated switch's datasheet minimum current limit, A (below its typical); absent: the typical only. */
  readonly currentLimitMinA?: number;
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

/**
 * Solve the stage at every corner. An integrated switch with a minimum current limit below its
 * typical one is solved at both: the corner's point at the minimum (the load's supply, a
 * collapse), its Tj and loss at whichever heats the die more (hotterAtLimit).
 */
export function solveCorners(stage: StageModel, space: CornerSpace): CornerResult[] {
  const maxStage = space.datasheetMax ? scaleStage(stage, space.datasheetMax) : stage;
  const typicalA = stage.kind === "integrated-switch" ? stage.currentLimitA : undefined;
  const minA =
    typicalA !== undefined && (space.currentLimitMinA ?? typicalA) < typicalA ? space.currentLimitMinA : undefined;
  return cornerConditions(space).map((c) => {
    const s = c.tolerance === "typical" ? stage : maxStage;
    const solve = (st: StageModel) =>
      solveThermalPoint({
        stage: st,
        supplyV: c.supplyV,
        sourceResistanceOhm: space.sourceResistanceOhm,
        load: scaleLoad(space.load, c.loadScale),
        ambientC: c.ambientC,
        rthKPerW: totalRthKPerW(st.thermal),
      });
    if (minA === undefined || typicalA === undefined) return { conditions: c, result: solve(s) };
    const atMin = solve(withCurrentLimit(s, minA));
    // below the minimum limit the limit does not act: the typical one gives the same point
    if ("point" in atMin && atMin.point.forward.mode !== "current-limit") return { conditions: c, result: atMin };
    const atTypical = solve(s);
    return hotter(atTypical, atMin)
      ? { conditions: c, result: atMin, hotterAtLimit: { currentLimitA: typicalA, result: atTypical } }
      : { conditions: c, result: atMin };
  });
}

function withCurrentLimit(stage: StageModel, currentLimitA: number): StageModel {
  return stage.kind === "integrated-switch" ? { ...stage, currentLimitA } : stage;
}

/** Whether a heats the die more than b: a runaway against a point, or a higher Tj. */
function hotter(a: OperatingPointOutcome<ThermalPoint>, b: OperatingPointOutcome<ThermalPoint>): boolean {
  if ("point" in b) return "point" in a ? a.point.tjC > b.point.tjC : a.outcome === "thermal-runaway";
  return false;
}

/** The corner's thermal figure (Tj, die loss): at the current limit that heats the die more (solveCorners). */
export function cornerThermal(c: CornerResult): OperatingPointOutcome<ThermalPoint> {
  return c.hotterAtLimit?.result ?? c.result;
}

/** The corner's outcome without an operating point (its point's, else its thermal figure's); undefined where both have one. */
export function cornerUnsolved(
  c: CornerResult,
): Exclude<OperatingPointOutcome<ThermalPoint>, { readonly point: ThermalPoint }> | undefined {
  if (!("point" in c.result)) return c.result;
  const th = cornerThermal(c);
  return "point" in th ? undefined : th;
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

/**
 * The worst corner per metric, among the corners that have an operating point: Tj and loss from
 * each corner's thermal figure (cornerThermal), drop and load voltage from its point. A corner
 * without either is unsolved.
 */
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
    const c = corners[i] as CornerResult;
    const r = c.result;
    const th = cornerThermal(c);
    if (!("point" in r) || !("point" in th)) {
      unsolved.push(i);
      continue;
    }
    const p = r.point;
    if (tjI < 0 || th.point.tjC > tj) {
      tjI = i;
      tj = th.point.tjC;
    }
    if (lossI < 0 || th.point.dieLossW > loss) {
      lossI = i;
      loss = th.point.dieLossW;
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
