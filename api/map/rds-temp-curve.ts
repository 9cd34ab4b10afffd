import { fitRdsTemperature } from "../../domain/fit/rds-temperature-fit.js";
import { cToK } from "../../domain/physics/constants.js";
import { gateFit, refusedFit } from "./fit-gate.js";

/**
 * Rds(on)(Tj) points → the power law's exponent (and R25 unless the points are normalised):
 * refused naming the points where no such law follows them, gated at 5 % of Rds(on) (acceptFit
 * overrides), the residuals in `assumptions`.
 */
export function fitRdsTempCurve(
  spec: {
    readonly points: readonly { readonly tjC: number; readonly factor?: number; readonly rdsOnOhm?: number }[];
    readonly acceptFit?: boolean | undefined;
  },
  normalised: boolean,
  path: (string | number)[],
  assumptions: string[],
) {
  const curve = {
    points: spec.points.map((p) => ({ tjC: p.tjC, value: p.factor ?? p.rdsOnOhm ?? 0 })),
    acceptFit: spec.acceptFit,
  };
  const fit = fitRdsTemperature(
    curve.points.map((p) => ({ tempK: cToK(p.tjC), value: p.value })),
    { normalised },
  );
  if (!fit.ok) throw refusedFit([...path, "points"], fit.reason, fit.points);
  const exact = curve.points.length === (normalised ? 1 : 2);
  const where = path.length === 0 ? "Rds(on)(Tj)" : path.join(".");
  const unit = normalised ? "(factor)" : "ohm";
  const describe = (i: number) => `${curve.points[i]?.tjC} °C, ${curve.points[i]?.value} ${unit}`;
  const what = `${where}: ${normalised ? "the exponent" : "R25 and the exponent"} of (T/298.15 K)^a fitted`;
  if (!exact)
    assumptions.push(
      gateFit(fit.quality, curve.acceptFit, [...path, "points"], what, unit, curve.points.length, describe),
    );
  return { fit, exact };
}
