import type { DiodeParams } from "../physics/diode.js";
import type { LeakageLaw } from "../physics/schottky-leakage.js";
import type { ChannelParams } from "../physics/mosfet-channel.js";
import type { ThermalPath } from "../physics/thermal-path.js";
import type { SoaLine } from "../checks/soa-lines.js";
import { behaviourOf } from "./stage-behaviours.js";

/**
 * The series protection stages, in domain terms: plain SI numbers, temperatures named by unit.
 * One discriminated union on `kind`; each kind's behaviour (forward law, reverse path, ratings,
 * start-up, scaling, quiescent current) is a module of its own, gathered in stage-behaviours.ts.
 */
export type StageModel =
  | DiodeStage
  | PFetStage
  | NFetLowSideStage
  | IdealDiodeStage
  | IntegratedSwitchStage
  | BackToBackStage;
export type StageKind = StageModel["kind"];

export interface DiodeStage {
  readonly kind: "pn-diode" | "schottky-diode";
  readonly diode: DiodeParams;
  /** The datasheet's reverse leakage (a Schottky always has a thermionic-emission law here, api/map/stage-model.ts); absent: Is(T) of the forward fit. */
  readonly reverseLeakage?: DatasheetLeakage;
  readonly reverseRatingV: number;
  readonly tjMaxC: number;
  readonly thermal: ThermalPath;
  /** Single-pulse avalanche energy rating at 25 °C starting Tj, J; absent: not rated. */
  readonly avalancheEnergyJ?: number;
  /** Repetitive peak forward current rating IFRM, A; absent: not given. */
  readonly peakRepetitiveCurrentA?: number;
}

/**
 * A datasheet reverse leakage: one point (at the rated reverse voltage), scaled in temperature by
 * the junction's own Is(T) law; or a thermionic-emission law fitted to IR(Tj, VR) points.
 */
export type DatasheetLeakage = { readonly currentA: number; readonly tempK: number } | { readonly law: LeakageLaw };

export interface MosfetModel {
  readonly channel: ChannelParams;
  readonly bodyDiode: DiodeParams;
  readonly vdsMaxV: number;
  readonly vgsMaxV: number;
  readonly tjMaxC: number;
  /** Single-pulse avalanche energy rating EAS at 25 °C starting Tj, J; absent: not rated. */
  readonly avalancheEnergyJ?: number;
  /** Repetitive peak drain current rating, A; absent: not given. */
  readonly peakRepetitiveCurrentA?: number;
  /** Single-pulse avalanche current rating IAS (the current EAS is rated at), A; absent: not given. */
  readonly avalancheCurrentA?: number;
  /** Off-state drain-source leakage IDSS at the rated VDS and a junction temperature (the body diode's reverse current), scaled in temperature by the body diode's Is(T); absent: Is(T) of the body diode. */
  readonly offStateLeakage?: DatasheetLeakage;
  /** Repetitive avalanche energy rating EAR, J per event; absent: not rated. */
  readonly repetitiveAvalancheEnergyJ?: number;
  /** Temperature coefficient of the drain-source breakdown, 1/K; absent: DEFAULT_VDS_TEMPCO_PER_K. */
  readonly vdsTempCoPerK?: number;
  /** Datasheet single-pulse SOA lines at a 25 °C case; absent: not given. */
  readonly soa?: readonly SoaLine[];
}

/** P-channel MOSFET in the supply line, gate pulled to ground: |Vgs| = min(Vout, clamp). */
export interface PFetStage {
  readonly kind: "pfet-high-side";
  readonly mosfet: MosfetModel;
  /** Zener clamp on the gate-source, V; absent: no clamp. */
  readonly gateClampV?: number;
  readonly thermal: ThermalPath;
}

/** N-channel MOSFET in the ground return, gate tied to the supply: Vgs = min(Vin, clamp). */
export interface NFetLowSideStage {
  readonly kind: "nfet-low-side";
  readonly mosfet: MosfetModel;
  readonly gateClampV?: number;
  readonly thermal: ThermalPath;
}

export interface ControllerModel {
  /** Input voltage from which the controller runs, V. */
  readonly startV: number;
  /** Gate-source drive available against input voltage (charge-pump output), sorted by inputV. */
  readonly gateDrive: readonly { readonly inputV: number; readonly gateSourceV: number }[];
  /** Forward drop the controller regulates to at light load, V (0: no regulation). */
  readonly regulatedDropV: number;
  readonly quiescentA: number;
  /** Fraction of time a duty-cycled charge pump releases the gate (body diode conducts), 0..1. */
  readonly gateReleaseFraction: number;
  readonly maxInputV?: number;
  /** Reverse voltage the controller's input pin withstands, V (magnitude). */
  readonly reverseRatingV?: number;
}

/** N-channel MOSFET in the supply line driven by an ideal-diode controller. */
export interface IdealDiodeStage {
  readonly kind: "nfet-ideal-diode";
  readonly mosfet: MosfetModel;
  readonly controller: ControllerModel;
  readonly thermal: ThermalPath;
}

/** Integrated switch: the MOSFET and its control on one die. */
export type ThermalShutdownBehaviour =
  | { readonly mode: "latched" }
  | { readonly mode: "auto-retry"; readonly hysteresisK: number };

export interface IntegratedSwitchStage {
  readonly kind: "integrated-switch";
  /** On-resistance at 25 °C, ohm, and its temperature law (channel with one point). */
  readonly channel: ChannelParams;
  /** Internal gate drive once running, V (above every Rds(on) point: fully enhanced). */
  readonly internalGateV: number;
  readonly startV: number;
  /** Below start: conducts through the body diode, or blocks. */
  readonly belowStart: { readonly mode: "body-diode"; readonly bodyDiode: DiodeParams } | { readonly mode: "blocks" };
  readonly regulatedDropV: number;
  readonly quiescentA: number;
  readonly maxVoltageV: number;
  /** Reverse voltage the switch blocks, V; absent: not rated for reverse. */
  readonly reverseRatingV?: number;
  /** Whether the switch turns off on reverse current (ideal-diode type) or conducts both ways. */
  readonly blocksReverseCurrent: boolean;
  /** Energy its internal FET or clamp absorbs in one pulse at 25 °C start, J; absent: not rated. */
  readonly avalancheEnergyJ?: number;
  /** Current the switch limits to (also into the output capacitance at start-up), A; absent: no limit. */
  readonly currentLimitA?: number;
  /** Junction temperature at which the switch shuts itself down, °C; absent: no thermal shutdown. */
  readonly thermalShutdownC?: number;
  /**
   * What the switch does after a thermal shutdown: stays off until power is cycled (latched), or
   * turns on again once its junction has cooled by hysteresisK (auto-retry); absent: latched (declared).
   */
  readonly afterThermalShutdown?: ThermalShutdownBehaviour;
  /** Input voltage above which the switch opens (overvoltage cut-off), V; absent: it passes every surge on. */
  readonly overvoltageCutoffV?: number;
  /** Time from the input crossing the cut-off to the switch open, s; absent: taken as instant (declared). */
  readonly overvoltageResponseS?: number;
  /**
   * Hysteresis of the overvoltage cut-off, V: once open, the switch recloses only when its input
   * falls below the threshold − this; absent: 0 (declared).
   */
  readonly overvoltageHysteresisV?: number;
  readonly tjMaxC: number;
  readonly thermal: ThermalPath;
}

/**
 * Two N-channel MOSFETs (the same part), common source, in the supply line, both gates driven by
 * one controller (nfet-back-to-back.ts): blocks both ways when off.
 */
export interface BackToBackStage {
  readonly kind: "nfet-back-to-back";
  /** Each of the two FETs. */
  readonly mosfet: MosfetModel;
  /** The controller or gate driver: start voltage, charge-pump drive, regulation, quiescent current. */
  readonly controller: ControllerModel;
  /** An ideal-diode controller turns both off on reverse current; a plain gate driver (load switch) keeps them on. */
  readonly blocksReverseCurrent: boolean;
  /** The pair's thermal path (both dies heat it). */
  readonly thermal: ThermalPath;
}

/** Junction limit of the die that carries the load current. */
export function stageTjMaxC(stage: StageModel): number {
  return behaviourOf(stage).tjMaxC(stage);
}

/** Input voltage from which the stage's control runs (undefined: a stage without one), V. */
export function stageStartV(stage: StageModel): number | undefined {
  return behaviourOf(stage).startV(stage);
}

/** Quiescent current drawn from the input to ground by the stage's control, A. */
export function stageQuiescentA(stage: StageModel): number {
  return behaviourOf(stage).quiescentA(stage);
}
