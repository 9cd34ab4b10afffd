import type { Requirement } from "../../contracts/requirement.js";
import type { ParallelLoad } from "../../domain/checks/clamp-energy.js";
import type { ClampPowerRating } from "../../domain/checks/clamp-rating.js";
import type { InputClamp } from "../../domain/checks/transient-clamp.js";

/** The input clamp: its law and power rating, defaults recorded (clamp-rating.ts). */
export function inputClampOf(c: NonNullable<Requirement["inputClamp"]>, assumptions: string[]): InputClamp {
  if (c.breakdownV === undefined)
    assumptions.push("inputClamp: no breakdownV, so a constant clamping voltage clampV (no dynamic resistance)");
  else if (c.peakCurrentA === undefined)
    assumptions.push(
      "inputClamp: breakdownV without peakCurrentA gives no dynamic resistance: a constant clampV is used",
    );
  let power: ClampPowerRating | undefined;
  if (c.peakPulsePowerW !== undefined) {
    if (c.referencePulseS === undefined)
      assumptions.push("inputClamp.referencePulseS: 1 ms (default: a 10/1000 us rating pulse, 1000 us to half value)");
    if (c.tjMaxC === undefined) assumptions.push("inputClamp.tjMaxC: 150 degC (default, common practice)");
    power = { peakPulsePowerW: c.peakPulsePowerW, referencePulseS: c.referencePulseS ?? 1e-3, tjMaxC: c.tjMaxC ?? 150 };
    assumptions.push(
      "inputClamp power: Ppp scaled by sqrt(reference width / the pulse's current half-width) (Wunsch-Bell) and derated linearly to 0 at tjMaxC from the highest ambient (common practice)",
    );
  }
  if (c.thermal === undefined)
    assumptions.push(
      "inputClamp.thermal: not given, so the clamp's junction over each test's pulse train is not assessed (give its Foster network)",
    );
  else {
    if (c.tjMaxC === undefined && power === undefined)
      assumptions.push("inputClamp.tjMaxC: 150 degC (default, common practice)");
    assumptions.push(
      "inputClamp.thermal: each pulse as a rectangle at its peak power carrying its energy (an upper bound of its junction rise), repeated at the test's interval and count from the highest ambient (clamp-train.ts)",
    );
  }
  return {
    standoffV: c.standoffV,
    clampV: c.clampV,
    breakdownV: c.breakdownV,
    peakCurrentA: c.peakCurrentA,
    energyJ: c.energyJ,
    tjMaxC: c.tjMaxC ?? 150,
    ...(power ? { power } : {}),
    ...(c.thermal === undefined ? {} : { thermal: c.thermal }),
  };
}

/** The module's load in parallel with the clamp: a constant-power load as the least current it draws, at the clamping voltage (the clamp's share the larger). */
export function parallelLoadOf(load: Requirement["load"], clampV: number): ParallelLoad {
  switch (load.kind) {
    case "resistive":
      return { kind: "resistive", resistanceOhm: load.resistanceOhm };
    case "constant-current":
      return { kind: "constant-current", currentA: load.currentA };
    case "constant-power":
      return { kind: "constant-current", currentA: load.powerW / clampV };
  }
}
