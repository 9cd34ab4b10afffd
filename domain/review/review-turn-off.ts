import { type ClampTrain, clampTrainTj, type PulseRepetition } from "../checks/clamp-train.js";
import type { ControllerTurnOff } from "../checks/reverse-path.js";
import type { TransientThermal } from "../checks/start-up.js";
import { stageAvalancheEnergyJ } from "../checks/stage-ratings.js";
import type { InputNodeClamp } from "../checks/turn-off-input-clamp.js";
import { type TurnOffModel, type TurnOffOutcome, turnOffEvent } from "../checks/turn-off-event.js";
import { type TurnOffWaveform, turnOffWaveform } from "../checks/turn-off-waveform.js";
import type { LoadModel } from "../solve/load-model.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";

/** The turn-off event of the review: the turnOff analysis's loop, with the output and Tj defaulted per candidate. */
export interface ReviewTurnOff {
  readonly inputAfterV: number;
  /** An input decaying from startV to inputAfterV (TurnOffModel.inputDecay). */
  readonly inputDecay?: { readonly startV: number; readonly tauS: number };
  /** A clamp at the input node holding the input at its level at the start (TurnOffModel.inputClamp). */
  readonly inputClamp?: InputNodeClamp;
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
  /** A P-FET's or low-side N-FET's gate lag, s (pfet-gate-off.ts). */
  readonly gateLagS?: number;
  /** The largest reverse voltage the load tolerates (magnitude), V. */
  readonly loadReverseLimitV?: number;
  /** How often the event repeats (interval and count): the blocking element's junction over the train. */
  readonly repetition?: PulseRepetition;
}

export interface ReviewTurnOffResult {
  readonly tjC: number;
  readonly tjSource: "given" | "worst-corner" | "highest-ambient";
  readonly repetitive: boolean;
  readonly avalancheRatingJ?: number;
  /** The load's reverse-voltage limit the requirement states, V. */
  readonly loadReverseLimitV?: number;
  readonly repetition?: PulseRepetition;
  readonly result: TurnOffOutcome;
  readonly waveform?: TurnOffWaveform;
  /**
   * With the event's repetition and the candidate's Foster network: the blocking element's
   * junction over the train of clamp phases (clamp-train.ts), from the event's Tj.
   */
  readonly train?: ClampTrain;
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
    readonly transientThermal?: TransientThermal;
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
    ...(t.inputDecay === undefined ? {} : { inputDecay: t.inputDecay }),
    ...(t.inputClamp === undefined ? {} : { inputClamp: t.inputClamp }),
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
    ...(t.gateLagS === undefined || !gateFollowsOutput(cand.stage) ? {} : { gateLagS: t.gateLagS }),
  };
  const result = turnOffEvent(model);
  const waveform = cand.turnOffWaveform ? turnOffWaveform(model, result) : undefined;
  const thermal = cand.transientThermal;
  const train =
    t.repetition !== undefined && thermal?.kind === "foster"
      ? eventTrain(result, thermal.terms, t.repetition, tjC)
      : undefined;
  return {
    tjC,
    tjSource,
    repetitive: t.repetitive,
    ...(avalancheRatingJ === undefined ? {} : { avalancheRatingJ }),
    ...(t.loadReverseLimitV === undefined ? {} : { loadReverseLimitV: t.loadReverseLimitV }),
    ...(t.repetition === undefined ? {} : { repetition: t.repetition }),
    result,
    ...(waveform ? { waveform } : {}),
    ...(train === undefined ? {} : { train }),
  };
}

/**
 * A FET whose gate is fed from the supply (a P-FET's gate to ground, a low-side N-FET's from the
 * positive rail; supply-gated-fet.ts): its gate-source sees the output, lagged by its gate resistor.
 */
export function gateFollowsOutput(stage: StageModel): boolean {
  return behaviourOf(stage).sizing.gateFromSupply;
}

/**
 * The clamp phase of each event as a rectangle at its peak power Vcl·I(turn-off) carrying its
 * absorbed energy (an upper bound of its heating, clamp-train.ts), repeated at the event's
 * interval and count. No clamp phase: the junction stays at the event's Tj. An event without a
 * response (clamp below the drive, an unstable loop) has no train.
 */
function eventTrain(
  r: TurnOffOutcome,
  terms: Parameters<typeof clampTrainTj>[2],
  rep: PulseRepetition,
  tjC: number,
): ClampTrain | undefined {
  if (r.outcome === "clamp-below-drive" || r.outcome === "invalid-load-line" || r.outcome === "unstable-loop")
    return undefined;
  const clamp = r.outcome === "blocks" ? r.clamp : r.outcome === "does-not-block" ? r.gateTurnOff?.clamp : undefined;
  if (clamp === undefined) return clampTrainTj(0, 0, terms, rep, tjC);
  return clampTrainTj(clamp.absorbedJ, clamp.clampV * clamp.currentAtTurnOffA, terms, rep, tjC);
}
