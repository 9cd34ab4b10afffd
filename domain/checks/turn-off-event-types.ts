import type { LoadModel } from "../solve/load-model.js";
import type { StageModel } from "../stages/stage-model.js";
import type { ControllerTurnOff } from "./reverse-path.js";
import type { InputClampHold, InputNodeClamp } from "./turn-off-input-clamp.js";
import type { LoopCharacter, PhaseEnergies } from "./turn-off-loop.js";

export interface TurnOffModel {
  readonly stage: StageModel;
  /** Output (capacitor) voltage before the event, in steady state (no capacitor current), V. */
  readonly outputV: number;
  /** Input voltage from t = 0 on: 0 for a short, or the lower voltage it steps to, V. */
  readonly inputAfterV: number;
  /**
   * An input that decays after the event instead of stepping: it is startV at t = 0+ and falls
   * (or rises) to inputAfterV as e^(−t/τ) (rlc-series.ts, exponential forcing). Absent: a step.
   */
  readonly inputDecay?: { readonly startV: number; readonly tauS: number };
  /**
   * A clamp at the input node (turn-off-input-clamp.ts): while the source behind the loop's
   * resistance would take the input below its level it holds the input there, then lets the input
   * follow the source (a held-then-decaying input). Absent: the input is the source's.
   */
  readonly inputClamp?: InputNodeClamp;
  /** Source and wiring resistance of the loop, without the stage, ohm. */
  readonly loopResistanceOhm: number;
  readonly loopInductanceH: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  readonly load: LoadModel;
  /** The load's minimum operating voltage, V. */
  readonly loadMinV: number;
  readonly tjC: number;
  readonly controller?: ControllerTurnOff;
  /** A diode stage's reverse-recovery charge, C (0: ideal). */
  readonly reverseRecoveryChargeC?: number;
  /** Voltage the blocking element clamps at (avalanche or TVS), V; default its rated voltage. */
  readonly clampV?: number;
  /** Single-pulse avalanche energy rating at 25 °C starting Tj, J (derated to the event's tjC). */
  readonly avalancheRatingJ?: number;
  /** A P-FET's gate lag Rg·Qg/Vgs, s (pfet-gate-off.ts; default 0: the gate follows the output at once). */
  readonly gateLagS?: number;
}

export interface WindowState {
  readonly timeS: number;
  readonly currentA: number;
  readonly outputV: number;
  readonly capacitorV: number;
  readonly chargeLostC: number;
  readonly voltageLostV: number;
}

export interface TurnOffCommon {
  readonly loop: LoopCharacter & { readonly totalResistanceOhm: number; readonly stageResistanceOhm: number };
  readonly loadMethod: string;
  readonly initialCurrentA: number;
  /** di/dt at t = 0+, A/s: (inputAfter − inputBefore)/L. */
  readonly initialSlopeAPerS: number;
  /**
   * Largest reverse current of the event, A (magnitude), at peakReverseTimeS: over the window, or
   * — where the stage keeps conducting past the window's end — until the current turns.
   */
  readonly peakReverseCurrentA: number;
  readonly peakReverseTimeS: number;
  /** Present (true) when the current was still rising at the end of the searched span: the peak is only a lower bound. */
  readonly peakReverseIsLowerBound?: true;
  readonly end: WindowState;
  readonly energies: PhaseEnergies;
  /** The output's lowest voltage over the event (the window, and the clamp phase where there is one), V: below 0 the load sees reverse voltage. */
  readonly outputMinV: number;
  /** The input clamp's hold at the start (TurnOffModel.inputClamp; absent: no clamp, or it did not conduct). */
  readonly inputClampHold?: InputClampHold;
}

/** A P-FET's channel turned off by its gate (pfet-gate-off.ts), and what the event cost until the current stopped. */
export interface GateTurnOff {
  readonly channelOffS: number;
  readonly gateLagS: number;
  readonly outputAtOffV: number;
  /** Loop current at the turn-off, A (negative: reverse). */
  readonly currentAtOffA: number;
  /** Largest reverse current up to the turn-off, A (magnitude): the clamp then drives it to zero. */
  readonly peakReverseCurrentA: number;
  /** Charge the output capacitor lost until the loop current stopped, C. */
  readonly chargeLostC: number;
  readonly outputMinV: number;
  /** State when the loop current stopped (at the turn-off, or the clamp phase's end). */
  readonly end: WindowState;
  readonly clamp?: ClampPhase;
}

export interface ClampPhase {
  readonly clampV: number;
  readonly currentAtTurnOffA: number;
  /** ½·L·I² at turn-off, J. */
  readonly inductiveEnergyJ: number;
  /** ½·L·I²·Vcl/(Vcl − Vs), Vs = output − input at turn-off (unclamped inductive switching). */
  readonly clampedFormulaJ: number;
  /** Vcl·∫|i|dt over the clamp phase from the exact loop response, J. */
  readonly absorbedJ: number;
  readonly durationS: number;
  readonly avalancheRatingJ?: number;
  /** The rating derated to the event's starting Tj (avalancheEnergyAtTjJ), J. */
  readonly avalancheRatingAtTjJ?: number;
  /** absorbedJ within avalancheRatingAtTjJ. */
  readonly withinAvalancheRating?: boolean;
  readonly after: WindowState;
  readonly energies: PhaseEnergies;
}

export type TurnOffOutcome =
  | ({
      readonly outcome: "blocks";
      readonly turnOffS: number;
      readonly detectS?: number;
      readonly clamp?: ClampPhase;
    } & TurnOffCommon)
  | ({
      readonly outcome: "does-not-block";
      readonly reason: string;
      readonly fallsBelowMinS?: number;
      readonly settlesAtV: number;
      /** A P-FET whose gate turned its channel off as the output fell (absent: it stays on). */
      readonly gateTurnOff?: GateTurnOff;
    } & TurnOffCommon)
  | ({ readonly outcome: "stays-on"; readonly reason: string } & TurnOffCommon)
  | {
      readonly outcome: "clamp-below-drive";
      readonly reason: string;
      readonly clampV: number;
      readonly driveV: number;
      readonly currentAtTurnOffA: number;
    }
  | { readonly outcome: "invalid-load-line"; readonly reason: string; readonly path: string }
  | {
      readonly outcome: "unstable-loop";
      readonly reason: string;
      /** "diverges": a real eigenvalue above zero (R·P/V² ≥ 1); "oscillation-grows": negative damping. */
      readonly mode: "diverges" | "oscillation-grows";
      /** ζ of the linearised loop (negative: negative damping; 0 where it diverges without oscillation). */
      readonly dampingRatio: number;
      /** Growth rate of the fastest-growing natural mode, 1/s. */
      readonly growthPerS: number;
      /** The constant-power load's incremental resistance at the pre-event output, −V²/P, ohm. */
      readonly loadIncrementalResistanceOhm: number;
    };
