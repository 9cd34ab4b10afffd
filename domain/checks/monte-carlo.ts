import { totalRthKPerW } from "../physics/thermal-path.js";
import { type OperatingPointOutcome, solveOperatingPoint } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { scaleLoad } from "../solve/load-scale.js";
import { createRng, type Rng } from "../solve/prng.js";
import { scaleStage } from "../stages/scale-stage.js";
import { type StageModel, stageStartV } from "../stages/stage-model.js";

export type McParameter =
  | "rdsOn"
  | "forwardVoltage"
  | "rth"
  | "supplyV"
  | "ambientC"
  | "load"
  | "startV"
  | "thresholdV";

/**
 * A tolerance: relative (factor 1 + x) for rdsOn, forwardVoltage, rth and load; absolute (V, °C)
 * for supplyV, ambientC, startV (a controller's or switch's start voltage) and thresholdV (Vth). Normal: sigma is the standard deviation; uniform: ±halfWidth.
 */
export type McTolerance =
  | { readonly parameter: McParameter; readonly distribution: "normal"; readonly sigma: number }
  | { readonly parameter: McParameter; readonly distribution: "uniform"; readonly halfWidth: number };

export interface McInput {
  readonly stage: StageModel;
  readonly supplyV: number;
  readonly ambientC: number;
  readonly sourceResistanceOhm: number;
  readonly load: LoadModel;
  readonly tolerances: readonly McTolerance[];
  /**
   * The datasheet's gate threshold range as shifts from the typical Vth (min − typical ≤ 0 ≤
   * max − typical), V: where given, each sample's Vth is drawn uniform over it, in place of any
   * thresholdV tolerance (the datasheet bounds the spread; no distribution is stated inside them).
   */
  readonly thresholdRangeV?: { readonly minShiftV: number; readonly maxShiftV: number };
  readonly samples: number;
  readonly seed: number;
}

export interface McSample {
  readonly draws: Readonly<Record<McParameter, number>>;
  readonly result: OperatingPointOutcome;
  /** The sample's start voltage (the stage's own plus its draw, at least 0), V; absent for a stage without one. */
  readonly startVoltageV?: number;
}

export interface Distribution {
  readonly mean: number;
  readonly std: number;
  readonly p1: number;
  readonly p5: number;
  readonly p50: number;
  readonly p95: number;
  readonly p99: number;
  readonly min: number;
  readonly max: number;
}

function draw(rng: Rng, t: McTolerance): number {
  return t.distribution === "normal" ? rng.normal() * t.sigma : (2 * rng.next() - 1) * t.halfWidth;
}

/** Seeded Monte Carlo over parameter tolerances at one operating condition; samples in order. */
export function monteCarlo(m: McInput, visit: (s: McSample) => void): void {
  const rng = createRng(m.seed);
  for (let i = 0; i < m.samples; i += 1) {
    const d: Record<McParameter, number> = {
      rdsOn: 0,
      forwardVoltage: 0,
      rth: 0,
      supplyV: 0,
      ambientC: 0,
      load: 0,
      startV: 0,
      thresholdV: 0,
    };
    const range = m.thresholdRangeV;
    for (const t of m.tolerances)
      if (range === undefined || t.parameter !== "thresholdV") d[t.parameter] += draw(rng, t);
    if (range !== undefined) d.thresholdV = range.minShiftV + rng.next() * (range.maxShiftV - range.minShiftV);
    // A relative draw below −100 % has no physical meaning: floor the factor at 1 % of nominal.
    const f = (x: number) => Math.max(1 + x, 0.01);
    const stage = scaleStage(m.stage, {
      rdsOnFactor: f(d.rdsOn),
      forwardVoltageFactor: f(d.forwardVoltage),
      rthFactor: f(d.rth),
      startShiftV: d.startV,
      thresholdShiftV: d.thresholdV,
    });
    const supplyV = Math.max(m.supplyV + d.supplyV, 1e-3);
    const result = solveOperatingPoint({
      stage,
      supplyV,
      sourceResistanceOhm: m.sourceResistanceOhm,
      load: scaleLoad(m.load, f(d.load)),
      ambientC: m.ambientC + d.ambientC,
      rthKPerW: totalRthKPerW(stage.thermal),
    });
    const startVoltageV = stageStartV(stage);
    visit(startVoltageV === undefined ? { draws: d, result } : { draws: d, result, startVoltageV });
  }
}

/** Mean, standard deviation and nearest-rank percentiles of a sample. */
export function distributionOf(values: readonly number[]): Distribution | undefined {
  if (values.length === 0) return undefined;
  const sorted = [...values].sort((a, b) => a - b);
  const n = sorted.length;
  const mean = sorted.reduce((s, v) => s + v, 0) / n;
  const variance = n > 1 ? sorted.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1) : 0;
  const q = (p: number) => sorted[Math.min(n - 1, Math.max(0, Math.ceil(p * n) - 1))] ?? mean;
  return {
    mean,
    std: Math.sqrt(variance),
    p1: q(0.01),
    p5: q(0.05),
    p50: q(0.5),
    p95: q(0.95),
    p99: q(0.99),
    min: sorted[0] ?? mean,
    max: sorted[n - 1] ?? mean,
  };
}
