import type { StageModel } from "../stages/stage-model.js";

/** Forward-side ratings that a supply overvoltage or transient at the stage input meets. */
export interface ForwardLimit {
  readonly element: "controller-input" | "switch-input" | "gate-source" | "none";
  readonly ratingV: number;
  /** The voltage this element sees for an input peak of inputV. */
  readonly seenV: (inputV: number) => number;
}

/**
 * Which part of each stage kind a positive input peak stresses: a controller's input pin, an
 * integrated switch's input, a P-/N-FET's gate-source (driven from the input, clamped), or none
 * (a conducting diode passes the overvoltage on to the load).
 */
export function forwardLimits(stage: StageModel): ForwardLimit[] {
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return [];
    case "pfet-high-side":
    case "nfet-low-side": {
      const clamp = stage.gateClampV;
      return [{ element: "gate-source", ratingV: stage.mosfet.vgsMaxV, seenV: (v) => (clamp === undefined ? v : Math.min(v, clamp)) }];
    }
    case "nfet-ideal-diode":
      return stage.controller.maxInputV === undefined ? [] : [{ element: "controller-input", ratingV: stage.controller.maxInputV, seenV: (v) => v }];
    case "integrated-switch":
      return [{ element: "switch-input", ratingV: stage.maxVoltageV, seenV: (v) => v }];
  }
}

/** Whether the stage blocks current flowing from its output back to its input. */
export function blocksReverseCurrent(stage: StageModel): boolean {
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
    case "nfet-ideal-diode":
      return true;
    case "pfet-high-side":
    case "nfet-low-side":
      return false;
    case "integrated-switch":
      return stage.blocksReverseCurrent;
  }
}

/** The blocking element's single-pulse avalanche energy rating (EAS at 25 °C start), J; undefined when not rated. */
export function stageAvalancheEnergyJ(stage: StageModel): number | undefined {
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return stage.avalancheEnergyJ;
    case "pfet-high-side":
    case "nfet-low-side":
    case "nfet-ideal-diode":
      return stage.mosfet.avalancheEnergyJ;
    case "integrated-switch":
      return stage.avalancheEnergyJ;
  }
}

/** Repetitive peak forward current rating of the element carrying the load current, A; undefined when not given. */
export function stagePeakRepetitiveCurrentA(stage: StageModel): number | undefined {
  switch (stage.kind) {
    case "pn-diode":
    case "schottky-diode":
      return stage.peakRepetitiveCurrentA;
    case "pfet-high-side":
    case "nfet-low-side":
    case "nfet-ideal-diode":
      return stage.mosfet.peakRepetitiveCurrentA;
    case "integrated-switch":
      return undefined;
  }
}
