import { cToK, kToC } from "../physics/constants.js";
import { type DiodeParams, saturationCurrentAt, emissionVoltageV } from "../physics/diode.js";
import { leakageCurrentA } from "../physics/schottky-leakage.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import { thermalFixedPoint } from "../solve/thermal-fixed-point.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import { type DatasheetLeakage, type StageModel, stageTjMaxC } from "../stages/stage-model.js";

/** A datasheet reverse leakage: a point scaled by the junction's own Is(T) law, or a fitted law. */
export type LeakagePoint = DatasheetLeakage;

/** The same leakage law scaled by s (the sizing's search over a template's leakage). */
export function scaleLeakage(l: LeakagePoint, s: number): LeakagePoint {
  return "law" in l
    ? { law: { ...l.law, refCurrentA: s * l.law.refCurrentA } }
    : { currentA: s * l.currentA, tempK: l.tempK };
}

export interface ReverseStress {
  /** Which element blocks the reversed supply. */
  readonly blockingElement: "diode" | "body-diode" | "integrated-switch";
  readonly partVoltageV: number;
  /** The element's reverse (or drain-source) rating, V; undefined when the part states none. */
  readonly ratingV: number | undefined;
  /** Reverse voltage on a controller's input pin and its rating, where there is a controller. */
  readonly controllerReverseV?: number;
  readonly controllerRatingV?: number;
  /** Gate-source voltage of a MOSFET stage while reversed, V. */
  readonly gateSourceV?: number;
  readonly note: string;
}

export type ReverseSteadyResult =
  | {
      readonly outcome: "blocks";
      readonly stress: ReverseStress;
      readonly leakageA: number;
      readonly leakagePowerW: number;
      readonly tjC: number;
      readonly ambientC: number;
      /** The junction settles above its Tj(max): it blocks, but outside its rating (the rules read reverseTjC). */
      readonly aboveTjMax: boolean;
    }
  | {
      readonly outcome: "leakage-runaway";
      readonly stress: ReverseStress;
      readonly reason: string;
      readonly leakageAtLimitA: number;
    };

/**
 * Reverse current of a junction at reverse voltage vR: Is(T)·(1 − e^(−vR/(n·Vt))), Shockley; with
 * a datasheet point, that point scaled by Is(T)/Is(T_point); with a fitted law, the law at (T, vR).
 */
export function junctionLeakageA(d: DiodeParams, reverseV: number, tK: number, point?: LeakagePoint): number {
  const shape = -Math.expm1(-reverseV / emissionVoltageV(d, tK));
  if (point && "law" in point) return leakageCurrentA(point.law, tK, reverseV);
  if (point) return (point.currentA * saturationCurrentAt(d, tK)) / saturationCurrentAt(d, point.tempK);
  return saturationCurrentAt(d, tK) * shape;
}

/** The element that blocks a steady reversed supply, and what it sees (each kind's own, domain/stages/). */
export function reverseStress(stage: StageModel, reverseV: number): { stress: ReverseStress; junction?: DiodeParams } {
  return behaviourOf(stage).reverseStress(stage, reverseV);
}

/**
 * Steady reverse polarity at reverseV (magnitude) and ambientC: which element blocks, the voltage
 * it sees against its rating, and its leakage current and power at the self-consistent junction
 * temperature (leakage grows steeply with temperature: a Schottky can run away in reverse).
 * Steady state: conservative for a reversal shorter than the thermal time constants.
 */
export function reverseSteady(
  stage: StageModel,
  reverseV: number,
  ambientC: number,
  leakagePoint?: LeakagePoint,
): ReverseSteadyResult {
  const { stress, junction } = reverseStress(stage, reverseV);
  if (junction === undefined)
    return {
      outcome: "blocks",
      stress,
      leakageA: 0,
      leakagePowerW: 0,
      tjC: ambientC,
      ambientC,
      aboveTjMax: ambientC > stageTjMaxC(stage),
    };
  const rth = totalRthKPerW(stage.thermal);
  const tjMaxC = stageTjMaxC(stage);
  const leakAt = (tK: number) => junctionLeakageA(junction, reverseV, tK, leakagePoint);
  const r = thermalFixedPoint<never>(ambientC, rth, tjMaxC + 150, (tK) => ({ ok: true, lossW: reverseV * leakAt(tK) }));
  if (r.kind === "root") {
    const leakageA = leakAt(r.tjK);
    return {
      outcome: "blocks",
      stress,
      leakageA,
      leakagePowerW: leakageA * reverseV,
      tjC: kToC(r.tjK),
      ambientC,
      aboveTjMax: kToC(r.tjK) > tjMaxC,
    };
  }
  return {
    outcome: "leakage-runaway",
    stress,
    reason: `reverse leakage heats the junction faster than ${rth} K/W can shed it: no stable point up to ${Math.round(tjMaxC + 150)} °C`,
    leakageAtLimitA: leakAt(cToK(tjMaxC)),
  };
}
