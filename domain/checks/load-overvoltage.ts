import type { TransientPulse } from "../review/transient-library.js";
import type { StageModel } from "../stages/stage-model.js";
import type { CutoffHold } from "./cutoff-hysteresis.js";
import type { TransientResult } from "./transient-stress.js";

export interface LoadPeak {
  readonly pulseId: string;
  /** Peak at the stage's input (after the design's clamp), V. */
  readonly inputPeakV: number;
  /** Peak the load sees, V. */
  readonly loadPeakV: number;
  /** Whether the stage's overvoltage cut-off opened in this pulse. */
  readonly cutOff: boolean;
}

export interface LoadOvervoltage {
  /** The switch's cut-off threshold and response time where it has one. */
  readonly cutoff?: { readonly thresholdV: number; readonly responseS: number };
  readonly pulses: readonly LoadPeak[];
  /** Highest voltage the load sees: steady supply, steady overvoltage (cut off above the threshold) and every positive pulse, V. */
  readonly loadVMaxV: number;
  /** The cut-off's hysteresis after an excursion: which steady levels keep the switch open (cutoff-hysteresis.ts). */
  readonly hold?: CutoffHold;
}

/**
 * What reaches the load from the positive surges. A conducting stage passes its input on (the
 * forward drop is not credited). An integrated switch with an overvoltage cut-off opens once the
 * input crosses its threshold Vth, after its response time tr: until then the load follows the
 * input. The input is bounded by the pulse's open-circuit rise, a straight line from the base to
 * the test's highest open-circuit peak over its rise time (a clamp only lowers it), so the load
 * sees at most min(input peak, Vth + (ΔVoc/tr,rise)·tr): the threshold itself for an instant
 * response, the whole input peak for a pulse with no rise time given (circuit reasoning; the
 * input stresses the switch up to its own rating either way: transient-stress.ts). A steady
 * overvoltage (jump start, long-term overvoltage) above the threshold is cut off at it.
 */
export function loadOvervoltage(
  stage: StageModel,
  pulses: readonly TransientPulse[],
  results: readonly TransientResult[],
  ctx: { readonly supplyNominalV: number; readonly supplyMaxV: number; readonly overvoltageV?: number },
): LoadOvervoltage {
  const cutoff =
    stage.kind === "integrated-switch" && stage.overvoltageCutoffV !== undefined
      ? { thresholdV: stage.overvoltageCutoffV, responseS: stage.overvoltageResponseS ?? 0 }
      : undefined;
  const byId = new Map(pulses.map((p) => [p.id, p] as const));
  const peaks: LoadPeak[] = [];
  for (const r of results) {
    if (r.polarity !== "positive") continue;
    const v = r.inputPeakV;
    if (cutoff === undefined || v <= cutoff.thresholdV) {
      peaks.push({ pulseId: r.pulseId, inputPeakV: v, loadPeakV: v, cutOff: false });
      continue;
    }
    const p = byId.get(r.pulseId);
    const baseV = p === undefined ? 0 : p.baseV === "supply" ? ctx.supplyNominalV : p.baseV;
    const highestV = p === undefined ? v : Math.max(baseV + p.amplitudeV, p.clampedAtV ?? 0, ...(p.sweep?.peakV ?? []));
    const through =
      cutoff.responseS === 0
        ? cutoff.thresholdV
        : p !== undefined && p.riseS > 0
          ? cutoff.thresholdV + ((highestV - baseV) / p.riseS) * cutoff.responseS
          : v;
    peaks.push({ pulseId: r.pulseId, inputPeakV: v, loadPeakV: Math.min(v, through), cutOff: true });
  }
  const steadyOv = ctx.overvoltageV ?? 0;
  const steadyAtLoad = cutoff === undefined ? steadyOv : Math.min(steadyOv, cutoff.thresholdV);
  return {
    ...(cutoff === undefined ? {} : { cutoff }),
    pulses: peaks,
    loadVMaxV: Math.max(ctx.supplyMaxV, steadyAtLoad, ...peaks.map((x) => x.loadPeakV)),
  };
}
