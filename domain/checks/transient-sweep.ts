import type { TransientPulse, TransientSweep } from "../review/transient-library.js";
import type { StageModel } from "../stages/stage-model.js";
import { type TransientContext, type TransientResult, transientStress } from "./transient-stress.js";

/** Grid of a swept test: Ri and td points, both ends included (fixed: a caller cannot enlarge it). */
export const SWEEP_RI_POINTS = 9;
export const SWEEP_TD_POINTS = 5;

/** The figures a sweep reports the worst case of. */
export type SweepFigure =
  | "inputPeakV"
  | "blockingStressV"
  | "clampEnergyJ"
  | "clampPeakCurrentA"
  | "clampTrainTjC"
  | "requiredClampEnergyJ";

/** Where a swept test's worst case of one or more figures lies. */
export interface SweepWorst {
  readonly worstOf: readonly SweepFigure[];
  readonly sourceResistanceOhm: number;
  readonly decayS: number;
  /** Peak open-circuit voltage at this Ri (including the base), V. */
  readonly peakOpenCircuitV: number;
  /** Points evaluated in the sweep. */
  readonly points: number;
}

export type SweptTransientResult = TransientResult & { readonly sweep?: SweepWorst };

function figure(r: TransientResult, f: SweepFigure): number {
  switch (f) {
    case "inputPeakV":
      return Math.abs(r.inputPeakV);
    case "blockingStressV":
      return Math.max(0, ...r.stresses.map((s) => s.seenV));
    case "clampEnergyJ":
      return r.designClamp?.duty.conducts === true ? r.designClamp.duty.energyJ : 0;
    case "clampPeakCurrentA":
      return r.designClamp?.duty.conducts === true ? r.designClamp.duty.peakCurrentA : 0;
    case "clampTrainTjC":
      return r.designClamp?.train?.outcome === "computed" ? r.designClamp.train.trainTjC : Number.NEGATIVE_INFINITY;
    case "requiredClampEnergyJ":
      return r.clamp.needed === true && r.clamp.atClampMax.conducts === true ? r.clamp.atClampMax.energyJ : 0;
  }
}

const FIGURES: readonly SweepFigure[] = [
  "inputPeakV",
  "blockingStressV",
  "clampEnergyJ",
  "clampPeakCurrentA",
  "clampTrainTjC",
  "requiredClampEnergyJ",
];

/** The pulse at one point of its sweep: the peak paired with Ri linearly between the standard's ends. */
export function sweepPoint(
  pulse: TransientPulse,
  sw: TransientSweep,
  riOhm: number,
  decayS: number,
  baseV: number,
): TransientPulse {
  const [r0, r1] = sw.sourceResistanceOhm;
  const [v0, v1] = sw.peakV;
  const share = r1 > r0 ? (riOhm - r0) / (r1 - r0) : 1;
  const peakV = v0 + (v1 - v0) * share;
  return { ...pulse, amplitudeV: peakV - baseV, sourceResistanceOhm: riOhm, decayS };
}

function grid(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => (n === 1 ? hi : lo + ((hi - lo) * i) / (n - 1)));
}

/**
 * A test given by ranges (ISO 16750-2 load dump: Us, Ri, td): every point of a fixed Ri × td grid
 * through transientStress, and for each figure (input peak, blocking-element stress, the design
 * clamp's energy, peak current and junction over the test's train, the required clamp's energy) the
 * point where it is worst (a figure no point gives, such as the train without a clamp network, has none).
 * Returns one result per distinct worst point, each saying which figures it is the worst of and
 * its Ri and td, so the rules read the worst of every figure. A pulse without a sweep is passed
 * through unchanged. Each figure is exact at the grid's points (the closed forms of
 * clamp-energy.ts); between them a figure that peaks inside a cell is read at its nearest point.
 */
export function sweptTransientStress(
  stage: StageModel,
  pulse: TransientPulse,
  ctx: TransientContext,
): SweptTransientResult[] {
  const sw = pulse.sweep;
  if (sw === undefined) return [transientStress(stage, pulse, ctx)];
  const baseV = pulse.baseV === "supply" ? ctx.supplyNominalV : pulse.baseV;
  const results: { r: TransientResult; riOhm: number; decayS: number; peakV: number }[] = [];
  for (const riOhm of grid(sw.sourceResistanceOhm[0], sw.sourceResistanceOhm[1], SWEEP_RI_POINTS)) {
    for (const decayS of grid(sw.decayS[0], sw.decayS[1], SWEEP_TD_POINTS)) {
      const p = sweepPoint(pulse, sw, riOhm, decayS, baseV);
      results.push({ r: transientStress(stage, p, ctx), riOhm, decayS, peakV: baseV + p.amplitudeV });
    }
  }
  const worstIndex = new Map<number, SweepFigure[]>();
  for (const f of FIGURES) {
    let best = 0;
    for (let i = 1; i < results.length; i += 1) {
      const a = results[i];
      const b = results[best];
      if (a !== undefined && b !== undefined && figure(a.r, f) > figure(b.r, f)) best = i;
    }
    const top = results[best];
    if (top === undefined || figure(top.r, f) === Number.NEGATIVE_INFINITY) continue;
    worstIndex.set(best, [...(worstIndex.get(best) ?? []), f]);
  }
  return [...worstIndex.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([i, worstOf]) => {
      const x = results[i];
      if (x === undefined) throw new Error("unreachable: sweep index out of range");
      return {
        ...x.r,
        pulseId: pulse.id,
        sweep: {
          worstOf,
          sourceResistanceOhm: x.riOhm,
          decayS: x.decayS,
          peakOpenCircuitV: x.peakV,
          points: results.length,
        },
      };
    });
}
