import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";

/** Forward-side ratings that a supply overvoltage or transient at the stage input meets. */
export interface ForwardLimit {
  readonly element: "controller-input" | "switch-input" | "gate-source" | "forward-blocking-fet" | "none";
  readonly ratingV: number;
  /** The voltage this element sees for an input peak of inputV. */
  readonly seenV: (inputV: number) => number;
}

/**
 * Which part of a stage a positive input peak stresses: a controller's input pin, an integrated
 * switch's input, a P-/N-FET's gate-source (driven from the input, clamped), the input-side FET of
 * a back-to-back pair, or none (a conducting diode passes the overvoltage on to the load). Each
 * kind declares its own (domain/stages/).
 */
export function forwardLimits(stage: StageModel): ForwardLimit[] {
  return behaviourOf(stage).forwardLimits(stage);
}

/** Whether the stage blocks current flowing from its output back to its input. */
export function blocksReverseCurrent(stage: StageModel): boolean {
  return behaviourOf(stage).blocksReverseCurrent(stage);
}

/** The blocking element's single-pulse avalanche energy rating (EAS at 25 °C start), J; undefined when not rated. */
export function stageAvalancheEnergyJ(stage: StageModel): number | undefined {
  return behaviourOf(stage).avalancheEnergyJ(stage);
}

/** Repetitive peak forward current rating of the element carrying the load current, A; undefined when not given. */
export function stagePeakRepetitiveCurrentA(stage: StageModel): number | undefined {
  return behaviourOf(stage).peakRepetitiveCurrentA(stage);
}
