import type { AcSourceAndFilter } from "../solve/ac-bridge-circuit.js";
import type { AcCircuitMetrics, AcElementMetrics } from "./bridge-ac-metrics.js";
import type { AcPeriodWaveform } from "./bridge-ac-waveform.js";
import type { BridgeElements, BridgePosition } from "./bridge-element.js";

export interface BridgeAcModel extends AcSourceAndFilter {
  readonly elements: BridgeElements;
  readonly ambientC: number;
}

export interface AcElementResult extends AcElementMetrics {
  readonly position: BridgePosition;
  readonly mode: "junction" | "body-diode" | "channel";
  readonly tjC: number;
  readonly tjMaxC: number;
  readonly reverseRatingV: number;
}

export interface AcSteadyState extends AcCircuitMetrics {
  readonly elements: readonly AcElementResult[];
  readonly totalElementLossW: number;
  /**
   * Work done: shooting iterations of the last isothermal solve; periods integrated in all
   * (a half-period map of a symmetric bridge counts ½, the predictor's coarse map included);
   * integrator steps over the converged period (the half period's twice, on the half map).
   */
  readonly solver: {
    readonly shootingIterations: number;
    readonly periodsIntegrated: number;
    readonly stepsLastPeriod: number;
    readonly thermalIterations: number;
  };
  /** One period of the steady state, when asked for (`waveformPoints`). */
  readonly waveform?: AcPeriodWaveform;
}

export interface BridgeAcOptions {
  /** Return one period as samples: this many evenly spaced times (bridge-ac-waveform.ts). */
  readonly waveformPoints?: number;
}

export type BridgeAcOutcome =
  | { readonly outcome: "solved"; readonly steadyState: AcSteadyState }
  | {
      readonly outcome: "over-temperature" | "load-undervoltage";
      readonly steadyState: AcSteadyState;
      readonly reason: string;
    }
  | {
      readonly outcome: "thermal-runaway";
      readonly position: BridgePosition;
      readonly reason: string;
      readonly searchedToC: number;
      readonly lossAtSearchEndW: number;
    }
  | {
      readonly outcome: "load-collapse" | "no-periodic-steady-state" | "no-thermal-convergence";
      readonly reason: string;
    }
  | { readonly outcome: "invalid-input"; readonly path: string; readonly reason: string };
