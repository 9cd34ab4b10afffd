import type { LoadModel } from "../solve/load-model.js";
import type { ConductionMode } from "../stages/conduction.js";
import type { BridgeElements, BridgePosition, Polarity } from "./bridge-element.js";

export interface BridgeDcModel {
  readonly elements: BridgeElements;
  /** Magnitude of the open-circuit supply voltage, V; both polarities are analysed. */
  readonly supplyV: number;
  readonly sourceResistanceOhm: number;
  readonly load: LoadModel;
  readonly ambientC: number;
}

export interface DcElementState {
  readonly position: BridgePosition;
  readonly role: "conducting" | "blocking";
  readonly mode: ConductionMode | "blocking";
  readonly currentA: number;
  readonly dropV: number;
  readonly lossW: number;
  readonly tjC: number;
  readonly tjMaxC: number;
  /** Reverse voltage across a blocking element, V (0 for a conducting one). */
  readonly reverseV: number;
  readonly reverseRatingV: number;
  /** Rth·dP/dTj of the element at its operating point (< 1: stable). */
  readonly thermalLoopGain: number;
}

export type DcPolarityOutcome =
  | {
      readonly outcome: "solved" | "over-temperature" | "load-undervoltage";
      readonly polarity: Polarity;
      readonly conducting: readonly [BridgePosition, BridgePosition];
      readonly bridgeInputV: number;
      readonly loadV: number;
      readonly loadCurrentA: number;
      readonly totalDropV: number;
      readonly totalLossW: number;
      readonly elements: readonly DcElementState[];
      readonly reason?: string;
    }
  | {
      readonly outcome: "thermal-runaway";
      readonly polarity: Polarity;
      readonly position: BridgePosition;
      readonly reason: string;
      readonly searchedToC: number;
      readonly lossAtSearchEndW: number;
    }
  | {
      readonly outcome: "load-collapse";
      readonly polarity: Polarity;
      readonly reason: string;
      readonly maxDeliverablePowerW?: number;
    };

export interface BridgeDcResult {
  readonly positive: DcPolarityOutcome;
  readonly negative: DcPolarityOutcome;
}
