import type { ReverseStress } from "../checks/reverse-steady.js";
import type { DiodeParams } from "../physics/diode.js";
import { fullEnhancementV } from "../physics/mosfet-channel.js";
import { gateDriveAt } from "./gate-drive.js";
import { mosfetMissing, mosfetPart } from "./mosfet-stage.js";
import type { IdealDiodeStage } from "./stage-model.js";

export type ControllerDriven = Pick<IdealDiodeStage, "mosfet" | "controller">;

/**
 * What a stage whose gate(s) a separate controller drives from its charge pump shares (the ideal
 * diode, the back-to-back pair): start voltage, gate drive from the input, the controller's own
 * quiescent current, its input pin that a reversed supply reaches, and its ratings.
 */
export const controllerDriven = {
  startV: (stage: ControllerDriven) => stage.controller.startV,
  withStartV: <S extends ControllerDriven>(stage: S, startV: number): S => ({
    ...stage,
    controller: { ...stage.controller, startV },
  }),
  driveAtInput: (stage: ControllerDriven, inputV: number) => {
    const c = stage.controller;
    const vgs = inputV >= c.startV ? gateDriveAt(c, inputV) : 0;
    return {
      inputV,
      startMarginV: inputV - c.startV,
      gateSourceV: vgs,
      gateDriveMarginV: vgs - fullEnhancementV(stage.mosfet.channel),
    };
  },
  quiescentA: (stage: ControllerDriven) => stage.controller.quiescentA,
  quiescentHeatsDie: false,
  gateDriveMetric: true,
  gateSourceClampV: () => undefined,
  controllerReversePin: true,
  describe: (stage: ControllerDriven) => ({
    metrics: { startVoltageV: stage.controller.startV },
    part: controllerPart(stage),
    missing: controllerMissing(stage),
  }),
};

/** A reversed supply: the gate held off, a body diode blocks (rated by VDS), the controller's pin sees it. */
export function controllerReverseStress(
  stage: ControllerDriven,
  reverseV: number,
  note: string,
): { stress: ReverseStress; junction: DiodeParams } {
  return {
    stress: {
      blockingElement: "body-diode",
      partVoltageV: reverseV,
      ratingV: stage.mosfet.vdsMaxV,
      controllerReverseV: reverseV,
      ...(stage.controller.reverseRatingV === undefined ? {} : { controllerRatingV: stage.controller.reverseRatingV }),
      gateSourceV: 0,
      note,
    },
    junction: stage.mosfet.bodyDiode,
  };
}

/** The MOSFET's ratings and the controller's input ratings (a controller driving one or two FETs). */
export function controllerPart(stage: ControllerDriven): Record<string, number> {
  const part = mosfetPart(stage.mosfet);
  if (stage.controller.maxInputV !== undefined) part["maxInputV"] = stage.controller.maxInputV;
  if (stage.controller.reverseRatingV !== undefined) part["controllerReverseRatingV"] = stage.controller.reverseRatingV;
  return part;
}

export function controllerMissing(stage: ControllerDriven): Record<string, string> {
  const out: Record<string, string> = {};
  if (stage.controller.reverseRatingV === undefined)
    out["part.controllerReverseRatingV"] =
      "the controller states no reverse rating of its input pin (controller.reverseRatingV): its survival of the reversed supply is unproven";
  return Object.assign(out, mosfetMissing(stage.mosfet));
}
