import type { PulseRepetition } from "../checks/clamp-train.js";

/**
 * Built-in transient pulses: an exponential open-circuit voltage Voc(t) = baseV + amplitudeV·e^(−t/τ)
 * behind a source resistance (negative pulses: amplitudeV < 0), or a level clamped centrally.
 * decayS follows the "to-10-percent" convention (τ = td/ln 10) unless stated (docs/references.md [M]).
 * Every value names its source: the standard, or "memory" to be confirmed against it.
 */
export interface TransientPulse {
  readonly id: string;
  readonly title: string;
  /** Supply the pulse rides on, V (0: applied with the supply disconnected; "supply": the requirement's nominal). */
  readonly baseV: number | "supply";
  /** Signed amplitude of the exponential above the base, V. */
  readonly amplitudeV: number;
  readonly sourceResistanceOhm: number;
  readonly riseS: number;
  readonly decayS: number;
  /** td to 10 % of the peak (τ = td/ln 10), to 50 % (τ = td/ln 2, a surge's tail), or τ itself. */
  readonly decayConvention: "to-10-percent" | "to-50-percent" | "time-constant";
  /** A centrally suppressed pulse: the module input is held at this level for the pulse. */
  readonly clampedAtV?: number;
  /**
   * A test whose standard gives ranges rather than one pulse: Ri and td are swept over these
   * ranges (transient-sweep.ts) and the worst case of each figure reported with its Ri and td.
   * The peak goes with Ri as the standard pairs them (lowest peak at the lowest Ri, highest at the
   * highest), linearly in between; amplitudeV/sourceResistanceOhm/decayS are the severe corner.
   */
  readonly sweep?: TransientSweep;
  /** How the test repeats the pulse (its interval and count), for the clamp's junction over the train. */
  readonly repetition?: PulseRepetition & { readonly source: string };
  readonly source: string;
  /**
   * Set where the level the library uses is not confirmed against the edition in force: what is unconfirmed and
   * why it may lie higher. The review puts it into its assumptions, so a caller sees it (docs/references.md).
   */
  readonly unconfirmed?: string;
}

export interface TransientSweep {
  readonly sourceResistanceOhm: readonly [number, number];
  readonly decayS: readonly [number, number];
  /** Peak open-circuit voltage (including the base) at the lowest and at the highest Ri, V. */
  readonly peakV: readonly [number, number];
}
