import type { ControllerTurnOff } from "../checks/reverse-path.js";
import { stageAvalancheEnergyJ } from "../checks/stage-ratings.js";
import { type TurnOffModel, type TurnOffOutcome, turnOffEvent } from "../checks/turn-off-event.js";
import { type TurnOffWaveform, turnOffWaveform } from "../checks/turn-off-waveform.js";
import type { LoadModel } from "../solve/load-model.js";
import type { StageModel } from "../stages/stage-model.js";

/** The turn-off event of the review: the turnOff analysis's loop, with the output and Tj defaulted per candidate. */
export interface ReviewTurnOff {
  readonly inputAfterV: number;
  readonly outputV: number;
  readonly loopResistanceOhm: number;
  readonly loopInductanceH: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  /** Junction temperature at the event, °C; absent: the candidate's worst-case Tj, else the highest ambient. */
  readonly tjC?: number;
  readonly reverseRecoveryChargeC?: number;
  readonly clampV?: number;
  /** The event repeats in service (its energy is held to the repetitive avalanche rating too). */
  readonly repetitive: boolean;
  /** A P-FET candidate's gate lag, s (pfet-gate-off.ts). */
  readonly gateLagS?: number;
  /** The largest reverse voltage the load tolerates (magnitude), V. */
  readonly loadReverseLimitV?: number;
}

export interface ReviewTurnOffResult {
  readonly tjC: number;
  readonly tjSource: "given" | "worst-corner" | "highest-ambient";
  readonly repetitive: boolean;
  readonly avalancheRatingJ?: number;
  /** The load's reverse-voltage limit the requirement states, V. */
  readonly loadReverseLimitV?: number;
  readonly result: TurnOffOutcome;
  readonly waveform?: TurnOffWaveform;
}

/**
 * The candidate through the reverse-current event (turnOffEvent, the turnOff analysis's own
 * closed-form model): the requirement's load and minimum load voltage (0 when none is stated),
 * the part's avalanche rating, Tj at the event as given, else the worst-case Tj of the corners
 * (the junction is hottest there when the input fails), else the highest ambient. A stage that
 * does not block reports its drain-back (outcome does-not-block).
 */
export function reviewTurnOff(
  t: ReviewTurnOff,
  req: { readonly load: LoadModel; readonly loadMinV?: number; readonly ambientMaxC: number },
  cand: {
    readonly stage: StageModel;
    readonly turnOffController?: ControllerTurnOff;
    readonly turnOffWaveform?: boolean;
  },
  worstTjC: number | undefined,
): ReviewTurnOffResult {
  const tjSource = t.tjC !== undefined ? "given" : worstTjC !== undefined ? "worst-corner" : "highest-ambient";
  const tjC = t.tjC ?? worstTjC ?? req.ambientMaxC;
  const avalancheRatingJ = stageAvalancheEnergyJ(cand.stage);
  const model: TurnOffModel = {
    stage: cand.stage,
    outputV: t.outputV,
    inputAfterV: t.inputAfterV,
    loopResistanceOhm: t.loopResistanceOhm,
    loopInductanceH: t.loopInductanceH,
    capacitanceF: t.capacitanceF,
    esrOhm: t.esrOhm,
    load: req.load,
    loadMinV: req.loadMinV ?? 0,
    tjC,
    ...(cand.turnOffController ? { controller: cand.turnOffController } : {}),
    ...(t.reverseRecoveryChargeC === undefined ? {} : { reverseRecoveryChargeC: t.reverseRecoveryChargeC }),
    ...(t.clampV === undefined ? {} : { clampV: t.clampV }),
    ...(avalancheRatingJ === undefined ? {} : { avalancheRatingJ }),
    ...(t.gateLagS === undefined || cand.stage.kind !== "pfet-high-side" ? {} : { gateLagS: t.gateLagS }),
  };
  const result = turnOffEvent(model);
  const waveform = cand.turnOffWaveform ? turnOffWaveform(model, result) : undefined;
  return {
    tjC,
    tjSource,
    repetitive: t.repetitive,
    ...(avalancheRatingJ === undefined ? {} : { avalancheRatingJ }),
    ...(t.loadReverseLimitV === undefined ? {} : { loadReverseLimitV: t.loadReverseLimitV }),
    result,
    ...(waveform ? { waveform } : {}),
  };
}
