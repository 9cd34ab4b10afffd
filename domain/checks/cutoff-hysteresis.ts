import type { LoadPeak } from "./load-overvoltage.js";

/** A steady level of the supply the input may sit at after an excursion. */
export interface SteadyLevel {
  readonly level: "supply-max" | "long-term-overvoltage" | "jump-start" | "abnormal-max";
  readonly levelV: number;
}

export interface CutoffHold {
  /** The cut-off threshold the hold is judged at (the lowest: datasheetMax.overvoltageCutoffMinV, else the typical), V. */
  readonly thresholdV: number;
  /** The cut-off's hysteresis, V (0 where the part states none). */
  readonly hysteresisV: number;
  /** Once open, the switch recloses only below this input, V: threshold − hysteresis. */
  readonly reclosesBelowV: number;
  /** What takes the input above the threshold (a positive pulse's id or a steady level); absent: nothing does. */
  readonly excursion?: string;
  /** Steady levels inside the band [reclosesBelowV, thresholdV] after an excursion: the switch stays open there and the load unpowered. */
  readonly heldOff: readonly SteadyLevel[];
}

/**
 * An integrated switch's overvoltage cut-off with hysteresis H: the switch opens when its input
 * crosses the threshold Vth and recloses only when the input falls below Vth − H (a comparator
 * with hysteresis, common practice). After an excursion above Vth (a positive pulse whose input
 * peak exceeds it, or a steady level above it), a steady level L with Vth − H ≤ L ≤ Vth keeps the
 * switch open: the load stays unpowered until the supply falls below Vth − H. The threshold is
 * the lowest (its band reaches lowest); with H = 0 no steady level is held off (a level at exactly
 * Vth is not above it: the switch was never open at it). Pure.
 */
export function cutoffHold(
  thresholdV: number,
  hysteresisV: number,
  levels: readonly SteadyLevel[],
  pulses: readonly LoadPeak[],
): CutoffHold {
  const reclosesBelowV = Math.max(0, thresholdV - hysteresisV);
  const pulse = pulses.find((p) => p.inputPeakV > thresholdV);
  const above = levels.find((l) => l.levelV > thresholdV);
  const excursion = pulse?.pulseId ?? above?.level;
  const heldOff =
    excursion === undefined || hysteresisV <= 0
      ? []
      : levels.filter((l) => l.levelV >= reclosesBelowV && l.levelV <= thresholdV);
  return {
    thresholdV,
    hysteresisV,
    reclosesBelowV,
    ...(excursion === undefined ? {} : { excursion }),
    heldOff,
  };
}
