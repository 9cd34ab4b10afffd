import type { BatteryModel } from "../physics/battery-ocv.js";
import type { StageModel } from "../stages/stage-model.js";

export interface ChargingModel {
  readonly source: BatteryModel;
  readonly target: BatteryModel;
  readonly stage: StageModel;
  readonly currentLimitA?: number;
  readonly ambientC: number;
  /** Stop at the first of: target SoC reached, current below a taper, source SoC floor, time. */
  readonly stop: {
    readonly targetSoc: number;
    readonly minCurrentA: number;
    readonly sourceMinSoc: number;
    readonly maxTimeS: number;
  };
  /** Relative tolerance of the adaptive step (absolute: 1e-9 of the target's capacity). */
  readonly rtol: number;
}

export type StopReason = "target-soc" | "taper-current" | "source-soc-floor" | "time-limit";

export interface ReverseCheck {
  readonly sourceOcvV: number;
  readonly targetOcvV: number;
  /** Current from the target back into the source, A (≥ 0 flows backwards). */
  readonly backCurrentA: number;
  readonly blocks: boolean;
  readonly mode: string;
}

export type ChargingOutcome =
  | {
      readonly outcome: "charged";
      readonly stoppedBy: StopReason;
      readonly timeS: number;
      readonly chargeMovedC: number;
      readonly finalSourceSoc: number;
      readonly finalTargetSoc: number;
      readonly finalCurrentA: number;
      readonly energy: {
        readonly sourceOutJ: number;
        readonly targetInJ: number;
        readonly stageLossJ: number;
        readonly resistanceLossJ: number;
        readonly limiterLossJ: number;
        readonly balanceResidual: number;
      };
      readonly errorBound: {
        readonly chargeC: number;
        readonly targetSoc: number;
        readonly timeS: number;
        readonly stageLossJ: number;
      };
      readonly peakStageTjC: number;
      readonly stageTjMaxC: number;
      /** The stage's junction passes its limit at some point of the charge. */
      readonly overTemperature: boolean;
      readonly steps: number;
      readonly reverse: ReverseCheck;
    }
  | {
      readonly outcome: "no-charge";
      readonly reason: string;
      readonly initialCurrentA: number;
      readonly reverse: ReverseCheck;
    }
  | { readonly outcome: "integration-failed"; readonly reason: string }
  | { readonly outcome: "thermal-runaway"; readonly reason: string };
