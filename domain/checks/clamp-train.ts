import type { ClampResult } from "./clamp-energy.js";
import { type FosterTerm, periodicTrainRiseK, zthKPerW } from "../physics/foster.js";

/** How often a test repeats its pulse: every periodS, count times. */
export interface PulseRepetition {
  readonly periodS: number;
  readonly count: number;
}

export type ClampTrain =
  | {
      readonly outcome: "computed";
      readonly periodS: number;
      readonly count: number;
      /** Width of the rectangular pulse at the peak power that carries the pulse's energy, E/Ppk, s. */
      readonly equivalentWidthS: number;
      /** The clamp's junction at the end of one pulse, °C. */
      readonly singlePulseTjC: number;
      /** At the end of the train's last pulse (its highest), °C. */
      readonly trainTjC: number;
      /** The periodic steady state's peak (the train repeated without end), °C: it bounds every finite train. */
      readonly steadyPeriodicTjC: number;
    }
  | { readonly outcome: "overlapping"; readonly reason: string };

/**
 * The clamp's junction temperature over a train of equal pulses, through its Foster network
 * (foster.ts, periodicTrainRiseK: superposition of the step responses summed as a geometric
 * series). Each pulse's power (an exponential tail) is replaced by a rectangle at its peak power
 * Ppk lasting E/Ppk, the same energy: for an impulse response h that falls with time (every
 * Foster network's does), ∫P(s)·h(t − s)ds under P ≤ Ppk and ∫P = E is largest with the power
 * packed at Ppk just before t (the bathtub principle), which is the rectangle's rise at its end,
 * so the figure is an upper bound of the true pulse's, pulse by pulse and so for the train
 * (docs/references.md, "Thermal"). The junction starts the train at startTjC (the highest ambient).
 * A period shorter than the rectangle's width is no train of separate pulses: its own outcome.
 */
export function clampTrainTj(
  energyJ: number,
  peakPowerW: number,
  thermal: readonly FosterTerm[],
  rep: PulseRepetition,
  startTjC: number,
): ClampTrain {
  if (!(energyJ > 0 && peakPowerW > 0)) {
    return {
      outcome: "computed",
      periodS: rep.periodS,
      count: rep.count,
      equivalentWidthS: 0,
      singlePulseTjC: startTjC,
      trainTjC: startTjC,
      steadyPeriodicTjC: startTjC,
    };
  }
  const widthS = energyJ / peakPowerW;
  if (!(widthS <= rep.periodS)) {
    return {
      outcome: "overlapping",
      reason: `the pulse's energy at its peak power lasts ${widthS.toPrecision(3)} s, longer than the ${rep.periodS} s period: the pulses overlap and are not a train of separate pulses`,
    };
  }
  const train = periodicTrainRiseK(thermal, { powerW: peakPowerW, widthS, periodS: rep.periodS, count: rep.count });
  return {
    outcome: "computed",
    periodS: rep.periodS,
    count: rep.count,
    equivalentWidthS: widthS,
    singlePulseTjC: startTjC + peakPowerW * zthKPerW(thermal, widthS),
    trainTjC: startTjC + train.lastPeakK,
    steadyPeriodicTjC: startTjC + train.steadyPeakK,
  };
}

/** A train the clamp conducts in, without the clamp's thermal network: a gap, with what to add. */
export interface ClampTrainNotAssessed {
  readonly outcome: "not-assessed";
  readonly reason: string;
}

export const NO_CLAMP_THERMAL_REASON =
  "the input clamp conducts in this pulse's train and gives no thermal network: its junction over the train is not assessed; add inputClamp.thermal (the clamp's junction-to-ambient Foster network, from its datasheet's Zth)";

/**
 * The clamp's junction over a pulse's train where the clamp conducts in it: through its Foster
 * network (clampTrainTj), or without one an explicit not-assessed outcome (a gap a release gate
 * sees, never a silent absence). No repetition or no conduction: undefined (no train to follow).
 */
export function clampTrainOf(
  duty: ClampResult,
  thermal: readonly FosterTerm[] | undefined,
  rep: PulseRepetition | undefined,
  startTjC: number,
): ClampTrain | ClampTrainNotAssessed | undefined {
  if (rep === undefined || duty.conducts !== true) return undefined;
  if (thermal === undefined) return { outcome: "not-assessed", reason: NO_CLAMP_THERMAL_REASON };
  return clampTrainTj(duty.energyJ, duty.peakPowerW, thermal, rep, startTjC);
}
