import type { Requirement } from "../../contracts/requirement.js";
import type { ReviewInrush } from "../../domain/review/review-inrush.js";

/**
 * The requirement's inrush → the review's: the input defaults to the highest steady supply (the
 * largest ½·C·V² and current), the loop adds the source resistance to the given one, the die
 * starts at the highest ambient, and the load during the charge defaults to the requirement's
 * load where it is constant-current or resistive; a constant-power load is not modelled in the
 * charge (its draw below its start voltage is not known): the inrush rules are then a gap.
 */
export function reviewInrushOf(
  r: Requirement,
  i: NonNullable<Requirement["inrush"]>,
  supplyMaxV: number,
  assumptions: string[],
): ReviewInrush {
  if (i.inputV === undefined) assumptions.push(`inrush.inputV: the highest steady supply ${supplyMaxV} V (default)`);
  if (i.loopResistanceOhm === undefined)
    assumptions.push("inrush.loopResistanceOhm: 0 ohm besides the source resistance (default)");
  assumptions.push(
    `inrush: the junction starts at the highest ambient ${r.ambient.maxC} °C (power-on: the die at ambient)`,
  );
  let load: ReviewInrush["load"];
  if (i.load !== undefined) load = i.load;
  else if (r.load.kind === "constant-power")
    load = {
      unmodelled:
        "a constant-power load's draw during the charge is not modelled: give requirement.inrush.load (none, constant-current or resistive)",
    };
  else {
    load = r.load;
    assumptions.push("inrush.load: the requirement's load draws during the charge (default)");
  }
  return {
    capacitanceF: i.outputCapacitanceF,
    inputV: i.inputV ?? supplyMaxV,
    loopResistanceOhm: (r.sourceResistanceOhm ?? 0) + (i.loopResistanceOhm ?? 0),
    ...(i.slewVPerS === undefined ? {} : { slewVPerS: i.slewVPerS }),
    load,
    ambientC: r.ambient.maxC,
  };
}
