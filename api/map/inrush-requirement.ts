import type { Requirement } from "../../contracts/requirement.js";
import { steadyOvervoltageV } from "../../domain/review/candidate-review.js";
import type { ReviewInrush } from "../../domain/review/review-inrush.js";

/** The supply's levels the stage can be switched on at (the steady range's top and its steady overvoltages), V. */
export interface InrushSupplyLevels {
  readonly supplyMaxV: number;
  readonly jumpStartV: number | undefined;
  readonly longTermOvervoltageV: number | undefined;
  readonly abnormalMaxV: number | undefined;
}

/**
 * The requirement's inrush → the review's: the input defaults to the highest level the stage can
 * be switched on at, the highest of the steady supply's top, the jump start (a start at 24 V on a
 * 12 V system), the long-term overvoltage and the abnormal service limit (the largest ½·C·V² and
 * current; steadyOvervoltageV, the one definition the clamp's stand-off reads too). The loop adds
 * the source resistance to the given one, the die starts at the highest ambient, and the load
 * during the charge defaults to the requirement's load; a constant-power one draws from its
 * minVoltageV (the lowest start its lockout can have).
 */
export function reviewInrushOf(
  r: Requirement,
  i: NonNullable<Requirement["inrush"]>,
  levels: InrushSupplyLevels,
  assumptions: string[],
): ReviewInrush {
  const inputV = i.inputV ?? defaultInrushInputV(levels, assumptions);
  if (i.loopResistanceOhm === undefined)
    assumptions.push("inrush.loopResistanceOhm: 0 ohm besides the source resistance (default)");
  assumptions.push(
    `inrush: the junction starts at the highest ambient ${r.ambient.maxC} °C (power-on: the die at ambient)`,
  );
  let load: ReviewInrush["load"];
  if (i.load !== undefined) load = i.load;
  else if (r.load.kind === "constant-power") {
    load = { kind: "constant-power", powerW: r.load.powerW, startV: r.load.minVoltageV };
    assumptions.push(
      `inrush.load: the requirement's ${r.load.powerW} W converter draws P/V from its minVoltageV ${r.load.minVoltageV} V during the charge (default; its undervoltage lockout starts it there or higher: starting lower, where P/V is largest, is the conservative end)`,
    );
  } else {
    load = r.load;
    assumptions.push("inrush.load: the requirement's load draws during the charge (default)");
  }
  return {
    capacitanceF: i.outputCapacitanceF,
    inputV,
    loopResistanceOhm: (r.sourceResistanceOhm ?? 0) + (i.loopResistanceOhm ?? 0),
    ...(i.slewVPerS === undefined ? {} : { slewVPerS: i.slewVPerS }),
    ...(i.currentLimitA === undefined ? {} : { controllerLimitA: i.currentLimitA }),
    load,
    ambientC: r.ambient.maxC,
  };
}

/** The highest level the stage can be switched on at, and the sentence that says which one it is. */
function defaultInrushInputV(l: InrushSupplyLevels, assumptions: string[]): number {
  const over = steadyOvervoltageV(l);
  if (over === undefined || over <= l.supplyMaxV) {
    assumptions.push(
      `inrush.inputV: the highest steady supply ${l.supplyMaxV} V (default; the supply has no higher steady level)`,
    );
    return l.supplyMaxV;
  }
  const which =
    over === l.jumpStartV
      ? "the jump start"
      : over === l.longTermOvervoltageV
        ? "the long-term overvoltage"
        : "the abnormal service limit";
  const named = [
    `steady ${l.supplyMaxV} V`,
    ...(l.jumpStartV === undefined ? [] : [`jump start ${l.jumpStartV} V`]),
    ...(l.longTermOvervoltageV === undefined ? [] : [`long-term overvoltage ${l.longTermOvervoltageV} V`]),
    ...(l.abnormalMaxV === undefined ? [] : [`abnormal limit ${l.abnormalMaxV} V`]),
  ];
  assumptions.push(
    `inrush.inputV: ${which} ${over} V, the highest level the stage can be switched on at (default; of ${named.join(", ")})`,
  );
  return over;
}

/** The sentence a back-to-back pair's inrush adds: which FET carries the drop (review-inrush.ts pairDissipation). */
export function pairInrushAssumption(path: readonly (string | number)[]): string {
  return `${path.join(".")}: inrush through a back-to-back pair: fully on at once each channel drops half; in a slew or at a current limit the input-side FET carries the whole drop and loss (the output-side FET conducts source to drain across its body diode: at most a diode drop; counted on the input-side FET, conservative), its SOA at the whole drop and its junction through the candidate's transientThermal taken as that FET's own`;
}
