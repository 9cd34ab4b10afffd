import type { Snapshot } from "./ac-bridge-circuit.js";

/** Index of an element in the accumulators: positive pair [0, 1], negative pair [2, 3]. */
export type ElementSlot = 0 | 1 | 2 | 3;

/** Integrals over one period (J, A·s, A²·s, V·s) and extremes. */
export interface PeriodIntegrals {
  readonly sourceEnergyJ: number;
  readonly lineA2s: number;
  readonly sourceResistanceEnergyJ: number;
  readonly inductorEnergyJ: number;
  readonly esrEnergyJ: number;
  readonly capEnergyJ: number;
  readonly capA2s: number;
  readonly loadEnergyJ: number;
  readonly loadAs: number;
  readonly outVs: number;
  readonly elementAs: readonly number[];
  readonly elementA2s: readonly number[];
  readonly elementEnergyJ: readonly number[];
  readonly elementPeakA: readonly number[];
  readonly elementMaxReverseV: readonly number[];
  readonly outMinV: number;
  readonly outMaxV: number;
  readonly lineMaxA: number;
}

export type PeriodOutcome =
  | {
      readonly ok: true;
      readonly end: readonly number[];
      readonly integrals: PeriodIntegrals;
      readonly steps: number;
      readonly trace?: readonly Snapshot[];
      /** ∂end/∂x0 (row i, column j), with `jacobian` asked for. */
      readonly jacobian?: readonly (readonly number[])[];
    }
  | { readonly ok: false; readonly code: "load-collapse"; readonly atS: number; readonly reason: string };

export interface PeriodOptions {
  /** Relative tolerance of the local error against a voltage scale and a current scale. */
  readonly rtol: number;
  readonly voltageScaleV: number;
  readonly currentScaleA: number;
  readonly record: boolean;
  /** Integrate to T/2 only (the half-wave map of a symmetric bridge, ac-bridge-half-wave.ts); default the whole period. */
  readonly halfPeriod?: boolean;
  /**
   * Also differentiate the discrete map: the stages' sensitivities (Snapshot.dCapAdB0 …) chained
   * through the TR and BDF2 stages on the accepted steps (the variational equation of the
   * one-step method, exact for its step sequence).
   */
  readonly jacobian?: boolean;
  /**
   * Step across the off intervals by the general method too (default false: a resistive or
   * constant-current load's off interval is one exact step, ac-bridge-off-interval.ts). For
   * checking the closed form against the general path.
   */
  readonly generalOffInterval?: boolean;
  /**
   * Without inductance: relative tolerance of the line current's defect against currentScaleA
   * (absent or 0: the current is not judged, only the voltage).
   */
  readonly currentRtol?: number;
}
