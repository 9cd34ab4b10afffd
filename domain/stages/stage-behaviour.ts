import type { ReversePath } from "../checks/reverse-path.js";
import type { ReverseStress } from "../checks/reverse-steady.js";
import type { DriveAtInput } from "../checks/start-up.js";
import type { ForwardLimit } from "../checks/stage-ratings.js";
import type { DiodeParams } from "../physics/diode.js";
import type { ThermalPath } from "../physics/thermal-path.js";
import type { ForwardState } from "./conduction.js";
import type { StageScale } from "./scale-stage.js";
import type { DatasheetLeakage, StageModel } from "./stage-model.js";
import type { ControllerTurnOff } from "./turn-off-timing.js";

/** The stage model of one kind (a kind shared by one interface, the two diodes, included). */
export type StageOf<K extends StageModel["kind"]> = StageModel extends infer S
  ? S extends StageModel
    ? K extends S["kind"]
      ? S
      : never
    : never
  : never;

/**
 * How a stage conducts when the voltage across it is reversed (steady state, series-branch.ts):
 * a junction (a diode, a body diode) with its datasheet leakage where given, a conducting
 * channel of resistance ohm (with the body diode in parallel where there is one), or an ideal
 * block (no path at all).
 */
export type ReverseConduction =
  | { readonly kind: "junction"; readonly diode: DiodeParams; readonly leakage?: DatasheetLeakage | undefined }
  | { readonly kind: "channel"; readonly ohm: number; readonly bodyDiode?: DiodeParams }
  | { readonly kind: "ideal-block" };

/** What a sizing asks of a part of this kind (domain/sizing/stage-spec.ts). */
export interface SizingTraits {
  /** The forward parameter searched for its limit. */
  readonly forward: "rdsOn" | "forwardVoltage";
  /** The part rating a steady reverse supply and the negative pulses are held against. */
  readonly reverseRating: "vrrmV" | "vdsMaxV" | "none";
  /** Its gate is driven from the supply (a gate-source rating to specify). */
  readonly gateFromSupply: boolean;
  /** Its Rds(on) is rated at a gate drive the supply must reach. */
  readonly ratedGateDrive: boolean;
  /** It has a start voltage, an input rating and a quiescent current to specify. */
  readonly control: boolean;
  /** Its reverse leakage is a part figure to size. */
  readonly leakage: boolean;
}

/** The rule metrics and part ratings the stage itself describes (api/map: rule inputs). */
export interface StageDescription {
  /** Metrics of the stage's own description (start voltage), beyond quiescentA and blocksReverseCurrent. */
  readonly metrics: Record<string, number>;
  /** Part ratings by vocabulary name (without tjMaxC, which every kind has). */
  readonly part: Record<string, number>;
  /** Ratings a review or a turn-off compares a stress with that the part does not state, with why. */
  readonly missing: Record<string, string>;
}

/**
 * The behaviour of one stage kind, declared once (one module per kind in this folder, gathered in
 * stage-behaviours.ts): its forward law, its reverse path, its ratings, its start-up, its scaling
 * and its quiescent current. Every analysis asks the record; none decides on a stage kind itself.
 */
export interface StageBehaviour<S extends StageModel> {
  /** Forward state carrying currentA ≥ 0 at tK with inputV at its input; `running` fixes the control's state. */
  readonly forward: (
    stage: S,
    currentA: number,
    tK: number,
    inputV: number,
    running: boolean | undefined,
  ) => ForwardState;
  /**
   * Current its control holds the load current at, A (an integrated switch's limit); absent or
   * undefined: none. With it, `atCurrentLimit` is the state there, the drop being what the load leaves.
   */
  readonly currentLimitA?: (stage: S) => number | undefined;
  readonly atCurrentLimit?: (stage: S, tK: number, inputV: number, loadV: number) => ForwardState;
  /** Input voltage above which its control opens the path (overvoltage cut-off), V; absent or undefined: none. */
  readonly cutoffV?: (stage: S) => number | undefined;
  /** Junction limit of the die that carries the load current, °C. */
  readonly tjMaxC: (stage: S) => number;
  /** Input voltage from which its control runs, V; undefined without one. */
  readonly startV: (stage: S) => number | undefined;
  /** The same stage with its control starting at startV (a stage without control unchanged). */
  readonly withStartV: (stage: S, startV: number) => S;
  /** Gate drive and start margins at an input voltage (dropV: the forward drop there). */
  readonly driveAtInput: (stage: S, inputV: number, dropV: number) => DriveAtInput;
  /** Quiescent current its control draws from the input to ground, A. */
  readonly quiescentA: (stage: S) => number;
  /** Where the quiescent power is dissipated: in the die carrying the load (an integrated switch) or in a separate controller. */
  readonly quiescentHeatsDie: boolean;
  /** The stage with a datasheet-maximum or sampled tolerance applied (thermal: its path already scaled). */
  readonly scale: (stage: S, s: StageScale, thermal: ThermalPath) => S;
  /** Input-side ratings a positive input peak meets. */
  readonly forwardLimits: (stage: S) => ForwardLimit[];
  /** Whether it blocks current flowing from its output back to its input. */
  readonly blocksReverseCurrent: (stage: S) => boolean;
  /** Whether its reverse turn-off needs a controller's timing (threshold and delay). */
  readonly needsTurnOffTiming: (stage: S) => boolean;
  /** Whether it is a junction whose stored (reverse-recovery) charge a turn-off removes. */
  readonly junctionRecovery: boolean;
  /** How the current reverses through it (turn-off, hold-up). */
  readonly reversePath: (
    stage: S,
    tK: number,
    inputBeforeV: number,
    inputAfterV: number,
    outputV: number,
    timing: ControllerTurnOff | undefined,
  ) => ReversePath;
  /** Steady reverse conduction between leftV (input) and rightV (output), rightV > leftV. */
  readonly reverseConduction: (stage: S, leftV: number, rightV: number, tK: number) => ReverseConduction;
  /** The diode that carries the current when a regulating control releases the gate; undefined: none. */
  readonly releasedGateDiode: (stage: S) => DiodeParams | undefined;
  /** The element that blocks a steady reversed supply, what it sees, and its junction. */
  readonly reverseStress: (stage: S, reverseV: number) => { stress: ReverseStress; junction?: DiodeParams };
  /** The junction that blocks once the stage is off, and its datasheet leakage. */
  readonly blockingJunction: (stage: S) => DiodeParams | undefined;
  readonly reverseLeakage: (stage: S) => DatasheetLeakage | undefined;
  /** The voltage at which the blocking element breaks down (the clamp of inductive energy), V. */
  readonly breakdownV: (stage: S) => number;
  /** Reverse voltage rating of the blocking element, V; undefined when the part states none. */
  readonly reverseRatingV: (stage: S) => number | undefined;
  /** Single-pulse avalanche energy rating, J, and repetitive peak current rating, A, of the element that carries the current. */
  readonly avalancheEnergyJ: (stage: S) => number | undefined;
  readonly peakRepetitiveCurrentA: (stage: S) => number | undefined;
  /** On-resistance at 25 °C at the highest characterised gate drive, and that drive; undefined for a junction. */
  readonly ratedRdsOn: (stage: S) => { readonly rdsOnOhm: number; readonly gateSourceV: number } | undefined;
  /** The diode whose forward voltage a sizing searches (a junction stage), undefined otherwise. */
  readonly forwardDiode: (stage: S) => DiodeParams | undefined;
  /** Its gate drive (from the operating point) is a rule metric: gateDriveMinV. */
  readonly gateDriveMetric: boolean;
  /** Its gate-source sees the supply (clamped): the review's gateSourceVMaxV. */
  readonly gateSourceClampV: (stage: S) => { readonly clampV: number | undefined } | undefined;
  /** It has a controller's input pin that a reversed supply reaches (controllerReverseVMaxV). */
  readonly controllerReversePin: boolean;
  readonly sizing: SizingTraits;
  readonly describe: (stage: S) => StageDescription;
}
