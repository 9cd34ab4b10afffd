import { behaviourOf } from "../../domain/stages/stage-behaviours.js";
import type { StageSpec } from "../../contracts/stage.js";
import type { ControllerTurnOff } from "../../domain/checks/reverse-path.js";
import type { LoadModel } from "../../domain/solve/load-model.js";
import { gateFollowsOutput } from "../../domain/review/review-turn-off.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import { inputProblem } from "../input-problem.js";

type Timing = {
  reverseThresholdV: number;
  turnOffDelayS: number;
  gateChargeC?: number | undefined;
  gateSinkCurrentA?: number | undefined;
};

/** Why a stage that turns off on reverse current has no timing: what to give. */
export const MISSING_TIMING =
  "required: this stage turns off on reverse current, give its reverseThresholdV and turnOffDelayS";

/**
 * The controller's reverse turn-off timing: the request's `turnOff`, else the stage controller's
 * own reverseThresholdV and turnOffDelayS; `"missing"` for a stage that turns off on reverse
 * current and has neither (controllerTiming refuses it).
 */
export function controllerTimingOf(
  spec: StageSpec,
  model: StageModel,
  given: Timing | undefined,
  path: (string | number)[],
  assumptions: string[],
): ControllerTurnOff | undefined | "missing" {
  const needs = behaviourOf(model).needsTurnOffTiming(model);
  if (!needs) return undefined;
  if (given !== undefined) {
    return {
      reverseThresholdV: given.reverseThresholdV,
      turnOffDelayS: given.turnOffDelayS,
      ...(given.gateChargeC === undefined ? {} : { gateChargeC: given.gateChargeC }),
      ...(given.gateSinkCurrentA === undefined ? {} : { gateSinkCurrentA: given.gateSinkCurrentA }),
    };
  }
  const own = "controller" in spec ? spec.controller : undefined;
  if (own?.reverseThresholdV !== undefined && own.turnOffDelayS !== undefined) {
    assumptions.push(
      `${path.join(".")}: reverse turn-off timing from the stage controller (threshold ${own.reverseThresholdV} V, delay ${own.turnOffDelayS} s, no gate-discharge time)`,
    );
    return { reverseThresholdV: own.reverseThresholdV, turnOffDelayS: own.turnOffDelayS };
  }
  return "missing";
}

/** controllerTimingOf, refusing a stage that needs a timing and has none (naming `path`). */
export function controllerTiming(
  spec: StageSpec,
  model: StageModel,
  given: Timing | undefined,
  path: (string | number)[],
  assumptions: string[],
): ControllerTurnOff | undefined {
  const t = controllerTimingOf(spec, model, given, path, assumptions);
  if (t === "missing") throw inputProblem("invalid-input", path, MISSING_TIMING);
  return t;
}

/** The load's minimum voltage: given, or a constant-power load's own minVoltageV. */
export function loadMinimumV(load: LoadModel, given: number | undefined, path: (string | number)[]): number {
  if (given !== undefined) return given;
  if (load.kind === "constant-power") return load.minVoltageV;
  throw inputProblem("invalid-input", path, "required: the load's minimum operating voltage");
}

export function stageLabel(
  spec: StageSpec,
  partId: string | undefined,
): { kind: string; name?: string; partId?: string } {
  return {
    kind: spec.kind,
    ...(spec.name === undefined ? {} : { name: spec.name }),
    ...(partId === undefined ? {} : { partId }),
  };
}

/**
 * The sentence for a diode stage whose reverse-recovery charge Qrr is not given: a Schottky is a
 * majority-carrier junction (no stored charge to speak of, common practice); a PN diode's Qrr keeps
 * it conducting backwards after the current reverses, so 0 understates the reverse peak and the
 * charge lost: a warning naming the field to give.
 */
export function missingQrrSentence(field: string, kind: StageModel["kind"] | "diode"): string {
  if (kind === "schottky-diode")
    return `${field}: 0 C (a Schottky junction stores no minority charge to speak of, common practice)`;
  return `warning: ${field}: not given, taken as 0 C for ${kind === "pn-diode" ? "this PN diode" : "PN diode candidates"}: a PN junction's stored charge keeps it conducting backwards after the current reverses, so the reverse-current peak and the charge lost are understated; give its Qrr from the datasheet`;
}

/** The declared default of a turn-off event's `repetitive` field. */
export const ONE_OFF_EVENT = (field: string): string =>
  `${field}: false (a one-off event: its energy is held to the single-pulse avalanche rating, not to the repetitive one)`;

/**
 * A supply-gated FET's gate lag Rg·Qg/Vgs from the request's gateLag (pfet-gate-off.ts), with the
 * sentence for a P-FET or low-side N-FET stage that gives none (its gate then follows the output
 * at once: the channel turns off as soon as the output is below threshold, the least reverse
 * voltage at the load).
 */
export function gateLagOf(
  given: { resistanceOhm: number; gateChargeC: number; atGateSourceV: number } | undefined,
  model: StageModel,
  field: string,
  assumptions: string[],
): number | undefined {
  if (given !== undefined) return (given.resistanceOhm * given.gateChargeC) / given.atGateSourceV;
  if (gateFollowsOutput(model))
    assumptions.push(
      `${field}: not given, so the ${model.kind === "pfet-high-side" ? "P-FET" : "low-side N-FET"}'s gate follows the output at once (no gate resistor lag): its channel turns off as soon as the output falls below threshold; a gate resistor keeps it on longer and lets a negative input pull the output lower`,
    );
  return undefined;
}
