import { T25_K } from "../physics/constants.js";
import { type CurveFit, firstFall, refuse } from "./curve-fit.js";
import { fitQuality } from "./fit-quality.js";
import { leastSquares } from "./least-squares.js";

/** A point of a datasheet Rds(on)(Tj) curve: absolute ohms, or the normalised factor R/R25. */
export interface RdsTempPoint {
  readonly tempK: number;
  readonly value: number;
}

/** The bound on an Rds(on)(Tj) fit's worst residual: 5 % of Rds(on) (issue 23's gate). */
export const RDS_FIT_BOUND = 0.05;

/**
 * Fit the power law R(T) = R25·(T/298.15 K)^α (mosfet-channel.ts, common practice) to Rds(on)
 * against Tj, by least squares on ln R (every point weighted by its relative error), α held in
 * 0..5 as the contracts hold it. R25 is fitted too (a normalised curve gives R25 near 1), so the
 * exponent does not lean on one point; normalised points (a factor R/R25) hold R25 at 1. Refused: fewer than two temperatures, and a curve that falls
 * with rising Tj by more than the bound (no α ≥ 0 follows it), with the offending points.
 */
export function fitRdsTemperature(
  points: readonly RdsTempPoint[],
  opts: { readonly normalised?: boolean } = {},
): CurveFit<{ readonly r25: number; readonly exponent: number }> {
  const normalised = opts.normalised === true;
  if (new Set(points.map((p) => p.tempK)).size < 2)
    return refuse("an Rds(on)(Tj) fit needs points at two temperatures or more");
  const fall = firstFall(
    points.map((p) => p.tempK),
    points.map((p) => p.value),
    RDS_FIT_BOUND,
  );
  if (fall !== undefined) {
    return refuse(
      `Rds(on) falls by more than 5 % with rising Tj between points ${fall[0]} and ${fall[1]}: no temperature law of the channel (exponent 0..5) follows that`,
      fall,
    );
  }
  const x = points.map((p) => Math.log(p.tempK / T25_K));
  const y = points.map((p) => Math.log(p.value));
  // Normalised points (R/R25) hold ln R25 at 0, fitting the exponent alone: the law as a part uses it.
  const sol = normalised
    ? leastSquares({
        residuals: (u) => x.map((xi, i) => (u[0] ?? 0) * xi - (y[i] ?? 0)),
        start: [2.3],
        lower: [0],
        upper: [5],
      })
    : leastSquares({
        residuals: (u) => x.map((xi, i) => (u[0] ?? 0) + (u[1] ?? 0) * xi - (y[i] ?? 0)),
        start: [y.reduce((s, v) => s + v, 0) / y.length, 2.3],
        lower: [Number.NEGATIVE_INFINITY, 0],
        upper: [Number.POSITIVE_INFINITY, 5],
      });
  if (sol.outcome !== "solved") return refuse(sol.reason);
  const r25 = normalised ? 1 : Math.exp(sol.params[0] ?? 0);
  const exponent = (normalised ? sol.params[0] : sol.params[1]) ?? 0;
  const modelled = points.map((p) => r25 * Math.exp(exponent * Math.log(p.tempK / T25_K)));
  const [seLn, seExp] = normalised ? [undefined, sol.standardErrors[0]] : sol.standardErrors;
  return {
    ok: true,
    params: { r25, exponent },
    // ln R25's standard error is R25's relative error; stated in R25's unit.
    standardErrors: {
      ...(seLn === undefined ? {} : { r25: seLn * r25 }),
      ...(seExp === undefined ? {} : { exponent: seExp }),
    },
    quality: fitQuality(
      modelled,
      points.map((p) => p.value),
      RDS_FIT_BOUND,
      sol,
    ),
    modelled,
  };
}
