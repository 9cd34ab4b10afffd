import type { z } from "zod";
import type { reverseLeakageCurve } from "../../contracts/stage.js";
import { cToK } from "../../domain/physics/constants.js";
import { fitLeakage } from "../../domain/fit/leakage-fit.js";
import { gateFit, refusedFit } from "./fit-gate.js";

type LeakageCurveSpec = z.output<typeof reverseLeakageCurve>;

/**
 * Reverse-leakage points → the thermionic-emission law: refused naming the points where no such
 * law follows them, gated at 25 % of IR (acceptFit overrides), the residuals in `assumptions`.
 */
export function fitLeakageCurve(spec: LeakageCurveSpec, path: (string | number)[], assumptions: string[]) {
  const fit = fitLeakage(spec.points.map((p) => ({ tempK: cToK(p.tjC), reverseV: p.reverseV, currentA: p.currentA })));
  if (!fit.ok) throw refusedFit([...path, "points"], fit.reason, fit.points);
  const fitsVoltage = new Set(spec.points.map((p) => p.reverseV)).size >= 2;
  const exact = (fitsVoltage ? 3 : 2) === spec.points.length;
  const where = path.length === 0 ? "reverse-leakage" : path.join(".");
  if (!fitsVoltage)
    assumptions.push(
      `${where}: the points are at one reverse voltage, so the VR power m is 0 (the law holds at that voltage)`,
    );
  const describe = (i: number) =>
    `${spec.points[i]?.tjC} °C, ${spec.points[i]?.reverseV} V, ${spec.points[i]?.currentA} A`;
  if (!exact) {
    assumptions.push(
      gateFit(
        fit.quality,
        spec.acceptFit,
        [...path, "points"],
        `${where}: barrier height${fitsVoltage ? ", VR power" : ""} and reference current of the thermionic-emission law fitted`,
        "A",
        spec.points.length,
        describe,
      ),
    );
  }
  return { fit, fitsVoltage, exact };
}
