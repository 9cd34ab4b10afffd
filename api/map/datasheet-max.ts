import { stageMosfet } from "../../domain/checks/breakdown-temperature.js";
import { gateThresholdColdV, withThresholdShift } from "../../domain/checks/gate-threshold.js";
import type { ControllerTurnOff } from "../../domain/checks/reverse-path.js";
import { type StageScale, UNSCALED } from "../../domain/stages/scale-stage.js";
import type { SwitchTolerance } from "../../domain/review/switch-tolerance.js";
import { type StageModel, stageStartV } from "../../domain/stages/stage-model.js";
import { inputProblem } from "../input-problem.js";

/** A candidate's datasheet-maximum tolerances as the contract gives them (contracts/review.ts). */
export interface DatasheetMaxSpec {
  readonly rdsOnFactor?: number | undefined;
  readonly forwardVoltageFactor?: number | undefined;
  readonly startV?: number | undefined;
  readonly thresholdV?: number | undefined;
  readonly thresholdMinV?: number | undefined;
  readonly reverseThresholdV?: number | undefined;
  readonly turnOffDelayS?: number | undefined;
  readonly currentLimitMinA?: number | undefined;
  readonly overvoltageCutoffMinV?: number | undefined;
  readonly overvoltageCutoffMaxV?: number | undefined;
}

/** The stage's own MOSFET gate threshold, V; undefined for a stage without a discrete MOSFET. */
export function mosfetThresholdV(stage: StageModel): number | undefined {
  return stage.kind === "pfet-high-side" || stage.kind === "nfet-low-side" || stage.kind === "nfet-ideal-diode"
    ? stage.mosfet.channel.thresholdV
    : undefined;
}

/**
 * The datasheet-maximum corner of a candidate as a stage scale: the factors (each absent is 1, the
 * typical value, said in `assumptions` where given), and the start voltage and gate threshold as
 * shifts from the stage's typical values (max − typical). Refused, naming the field, where the
 * stage has no such parameter or the maximum is below the typical value.
 */
export function datasheetMaxScale(
  dm: DatasheetMaxSpec,
  stage: StageModel,
  path: (string | number)[],
  assumptions?: string[],
): StageScale {
  const missing = [
    ...(dm.rdsOnFactor === undefined ? ["rdsOnFactor (Rds(on), an integrated switch's on-resistance)"] : []),
    ...(dm.forwardVoltageFactor === undefined
      ? ["forwardVoltageFactor (a diode's or body diode's forward voltage)"]
      : []),
  ];
  if (missing.length > 0)
    assumptions?.push(
      `${path.join(".")}: ${missing.join(" and ")} not given: taken as 1, the datasheet-maximum corners at the typical value there`,
    );
  const shift = (
    field: "startV" | "thresholdV",
    max: number | undefined,
    typical: number | undefined,
    what: string,
  ): number => {
    if (max === undefined) return 0;
    if (typical === undefined)
      throw inputProblem(
        "invalid-input",
        [...path, field],
        `this ${stage.kind} stage has no ${what}: leave ${field} out`,
      );
    if (max < typical)
      throw inputProblem(
        "invalid-input",
        [...path, field],
        `the datasheet maximum ${max} V is below the stage's typical ${what} ${typical} V: give the maximum (at or above ${typical} V)`,
      );
    return max - typical;
  };
  return {
    ...UNSCALED,
    rdsOnFactor: dm.rdsOnFactor ?? 1,
    forwardVoltageFactor: dm.forwardVoltageFactor ?? 1,
    startShiftV: shift("startV", dm.startV, stageStartV(stage), "start voltage"),
    thresholdShiftV: shift("thresholdV", dm.thresholdV, mosfetThresholdV(stage), "MOSFET gate threshold"),
  };
}

/**
 * The turn-off timing at the datasheet maximum: the larger of the typical and the maximum reverse
 * threshold and delay (both only lengthen the reverse current's rise before the gate is off: the
 * turn-off event's worst case), said in `assumptions`.
 */
export function worstTurnOffTiming(
  timing: ControllerTurnOff | undefined,
  dm: DatasheetMaxSpec | undefined,
  path: (string | number)[],
  assumptions: string[],
): ControllerTurnOff | undefined {
  if (
    timing === undefined ||
    dm === undefined ||
    (dm.reverseThresholdV === undefined && dm.turnOffDelayS === undefined)
  )
    return timing;
  const reverseThresholdV = Math.max(timing.reverseThresholdV, dm.reverseThresholdV ?? 0);
  const turnOffDelayS = Math.max(timing.turnOffDelayS, dm.turnOffDelayS ?? 0);
  assumptions.push(
    `${path.join(".")}: the turn-off event at the datasheet maximum timing (reverse threshold ${reverseThresholdV} V, delay ${turnOffDelayS} s)`,
  );
  return { ...timing, reverseThresholdV, turnOffDelayS };
}

/**
 * The datasheet-minimum gate threshold as a shift from the typical (min − typical, 0 or less), for
 * the turn-off event: a lower Vth keeps a channel held by the remaining voltage on longer in
 * reverse. Refused, naming the field, on a stage without a MOSFET or above the typical value.
 */
export function thresholdMinShiftV(dm: DatasheetMaxSpec, stage: StageModel, path: (string | number)[]): number {
  if (dm.thresholdMinV === undefined) return 0;
  const typical = mosfetThresholdV(stage);
  if (typical === undefined)
    throw inputProblem(
      "invalid-input",
      [...path, "thresholdMinV"],
      `this ${stage.kind} stage has no MOSFET gate threshold: leave thresholdMinV out`,
    );
  if (dm.thresholdMinV > typical)
    throw inputProblem(
      "invalid-input",
      [...path, "thresholdMinV"],
      `the datasheet minimum ${dm.thresholdMinV} V is above the stage's typical MOSFET gate threshold ${typical} V: give the minimum (at or below ${typical} V)`,
    );
  return dm.thresholdMinV - typical;
}

/**
 * Says in `assumptions` which gate threshold corners a candidate is taken at: the cold gate
 * overdrive at the datasheet maximum (else the typical) Vth moved to the coldest ambient by the
 * part's coefficient (gateThresholdColdV, as the review), the turn-off event at the datasheet
 * minimum (else the typical). Nothing for a stage without a discrete MOSFET.
 */
export function noteThresholdCorners(
  stage: StageModel,
  dm: DatasheetMaxSpec | undefined,
  ambientMinC: number,
  label: string,
  assumptions: string[],
): void {
  const typical = mosfetThresholdV(stage);
  const fet = stageMosfet(stage);
  if (typical === undefined || fet === undefined) return;
  const maxV = dm?.thresholdV;
  const cold = gateThresholdColdV(withThresholdShift(stage, (maxV ?? typical) - typical), ambientMinC);
  const k = fet.channel.thresholdTempCoVPerK;
  const high =
    maxV === undefined
      ? `the typical Vth ${typical} V (no datasheetMax.thresholdV given)`
      : `Vth(max) ${maxV} V (datasheetMax.thresholdV)`;
  const moved =
    k === undefined || k === 0
      ? `held at its 25 °C value at the coldest ambient ${ambientMinC} °C (no mosfet.thresholdTempCoVPerK or thresholdAtTj given)`
      : `moved by ${k} V/K to the coldest ambient ${ambientMinC} °C`;
  const low =
    dm?.thresholdMinV === undefined
      ? `the typical Vth ${typical} V (no datasheetMax.thresholdMinV given)`
      : `Vth(min) ${dm.thresholdMinV} V (datasheetMax.thresholdMinV)`;
  assumptions.push(
    `${label}: gate threshold corners: the cold gate overdrive (gateOverdriveColdV) at ${high}, ${moved}: ${cold} V there; a turn-off event at ${low}`,
  );
}

/**
 * An integrated switch's current limit and cut-off threshold at their datasheet extremes: the
 * lowest limit (the inrush and the limit rule), the lowest threshold (the rule against the steady
 * supply) and the highest (what reaches the load). Each not given is the typical value, said in
 * `assumptions`. Refused, naming the field, on a stage without that protection or on the wrong
 * side of the typical value.
 */
export function switchTolerance(
  dm: DatasheetMaxSpec | undefined,
  stage: StageModel,
  path: (string | number)[],
  assumptions: string[],
): SwitchTolerance | undefined {
  const limitA = stage.kind === "integrated-switch" ? stage.currentLimitA : undefined;
  const cutoffV = stage.kind === "integrated-switch" ? stage.overvoltageCutoffV : undefined;
  const at = path.join(".");
  const check = (
    field: "currentLimitMinA" | "overvoltageCutoffMinV" | "overvoltageCutoffMaxV",
    typical: number | undefined,
    what: string,
    side: "min" | "max",
    unit: string,
  ): number | undefined => {
    const v = dm?.[field];
    if (v === undefined) return undefined;
    if (typical === undefined)
      throw inputProblem(
        "invalid-input",
        [...path, field],
        `this ${stage.kind} stage has no ${what}: leave ${field} out`,
      );
    if (side === "min" ? v > typical : v < typical)
      throw inputProblem(
        "invalid-input",
        [...path, field],
        `the datasheet ${side === "min" ? "minimum" : "maximum"} ${v} ${unit} is ${side === "min" ? "above" : "below"} the stage's typical ${what} ${typical} ${unit}: give the ${side === "min" ? "minimum" : "maximum"} (at or ${side === "min" ? "below" : "above"} ${typical} ${unit})`,
      );
    return v;
  };
  const limitMinA = check("currentLimitMinA", limitA, "current limit", "min", "A");
  const cutoffMinV = check("overvoltageCutoffMinV", cutoffV, "overvoltage cut-off", "min", "V");
  const cutoffMaxV = check("overvoltageCutoffMaxV", cutoffV, "overvoltage cut-off", "max", "V");
  if (limitA !== undefined && limitMinA === undefined)
    assumptions.push(
      `${at}: the current limit's tolerance not given (datasheetMax.currentLimitMinA): the steady corners, the inrush and switch-current-limit-above-load use the typical ${limitA} A`,
    );
  if (cutoffV !== undefined && (cutoffMinV === undefined || cutoffMaxV === undefined))
    assumptions.push(
      `${at}: the overvoltage cut-off's tolerance not given (datasheetMax.overvoltageCutoffMinV / overvoltageCutoffMaxV): the typical ${cutoffV} V stands for ${cutoffMinV === undefined && cutoffMaxV === undefined ? "both" : cutoffMinV === undefined ? "the lowest" : "the highest"} (switch-cutoff-above-supply reads the lowest, load-overvoltage the highest)`,
    );
  if (limitMinA === undefined && cutoffMinV === undefined && cutoffMaxV === undefined) return undefined;
  return {
    ...(limitMinA === undefined ? {} : { currentLimitMinA: limitMinA }),
    ...(cutoffMinV === undefined ? {} : { overvoltageCutoffMinV: cutoffMinV }),
    ...(cutoffMaxV === undefined ? {} : { overvoltageCutoffMaxV: cutoffMaxV }),
  };
}
