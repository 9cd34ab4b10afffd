import { T25_K } from "../physics/constants.js";
import { type LeakageLaw, leakageCurrentA, leakageLogRatio } from "../physics/schottky-leakage.js";
import { type CurveFit, firstFall, refuse } from "./curve-fit.js";
import { fitQuality } from "./fit-quality.js";
import { leastSquares } from "./least-squares.js";

export interface LeakagePointTV {
  readonly tempK: number;
  readonly reverseV: number;
  readonly currentA: number;
}

/**
 * The bound on a leakage fit's worst residual: 25 % of IR. Leakage curves are read off log axes
 * spanning decades, where a quarter is about a tenth of a decade; the parts themselves spread by
 * factors (a stated project choice, not a standard's figure).
 */
export const LEAKAGE_FIT_BOUND = 0.25;

/** Points grouped by one coordinate (exact equality), each group's indices in the caller's order. */
function groups(points: readonly LeakagePointTV[], key: (p: LeakagePointTV) => number): number[][] {
  const m = new Map<number, number[]>();
  points.forEach((p, i) => {
    m.set(key(p), [...(m.get(key(p)) ?? []), i]);
  });
  return [...m.values()];
}

/**
 * Fit the thermionic-emission leakage law (schottky-leakage.ts) to IR(Tj, VR) points by least
 * squares on ln IR: ΦB (0.1..2 eV) and the reference current at 25 °C and the highest VR of the
 * points, and the VR power m (0..3) where the points span two reverse voltages or more (else m = 0).
 * Refused: points at one temperature only (the barrier needs two), and a curve whose IR falls (by more
 * than the bound) with rising Tj at one VR or with rising VR at one Tj (no law of this form follows it), with the points.
 */
export function fitLeakage(points: readonly LeakagePointTV[]): CurveFit<LeakageLaw> {
  if (new Set(points.map((p) => p.tempK)).size < 2)
    return refuse(
      "a leakage fit needs points at two junction temperatures or more (the barrier height comes from the temperature slope)",
    );
  const sweeps = [
    {
      along: (p: LeakagePointTV) => p.tempK,
      held: (p: LeakagePointTV) => p.reverseV,
      what: "Tj",
      same: "VR",
      why: "thermionic emission rises with temperature",
    },
    {
      along: (p: LeakagePointTV) => p.reverseV,
      held: (p: LeakagePointTV) => p.tempK,
      what: "VR",
      same: "Tj",
      why: "no leakage law follows that",
    },
  ];
  for (const sweep of sweeps) {
    for (const g of groups(points, sweep.held)) {
      const fall = firstFall(
        g.map((i) => (points[i] === undefined ? 0 : sweep.along(points[i]))),
        g.map((i) => points[i]?.currentA ?? 0),
        LEAKAGE_FIT_BOUND,
      );
      if (fall === undefined) continue;
      const pair = [g[fall[0]] ?? 0, g[fall[1]] ?? 0];
      return refuse(
        `the reverse current falls by more than 25 % with rising ${sweep.what} between points ${pair[0]} and ${pair[1]} (same ${sweep.same}): ${sweep.why}`,
        pair,
      );
    }
  }
  const refVoltageV = Math.max(...points.map((p) => p.reverseV));
  const fitM = new Set(points.map((p) => p.reverseV)).size >= 2;
  const law = (u: readonly number[]): LeakageLaw => ({
    refCurrentA: Math.exp(u[0] ?? 0),
    refTempK: T25_K,
    refVoltageV,
    barrierEv: u[1] ?? 0,
    voltageExponent: fitM ? (u[2] ?? 0) : 0,
  });
  const y = points.map((p) => Math.log(p.currentA));
  const sol = leastSquares({
    residuals: (u) => {
      const l = law(u);
      return points.map((p, i) => (u[0] ?? 0) + leakageLogRatio(l, p.tempK, p.reverseV) - (y[i] ?? 0));
    },
    start: fitM ? [Math.log(points[0]?.currentA ?? 1e-6), 0.6, 0.5] : [Math.log(points[0]?.currentA ?? 1e-6), 0.6],
    lower: [Number.NEGATIVE_INFINITY, 0.1, 0],
    upper: [Number.POSITIVE_INFINITY, 2, 3],
  });
  if (sol.outcome !== "solved") return refuse(sol.reason);
  const params = law(sol.params);
  const modelled = points.map((p) => leakageCurrentA(params, p.tempK, p.reverseV));
  const [seLn, seB, seM] = sol.standardErrors;
  return {
    ok: true,
    params,
    standardErrors: {
      ...(seLn === undefined ? {} : { refCurrentA: seLn * params.refCurrentA }),
      ...(seB === undefined ? {} : { barrierEv: seB }),
      ...(seM === undefined ? {} : { voltageExponent: seM }),
    },
    quality: fitQuality(
      modelled,
      points.map((p) => p.currentA),
      LEAKAGE_FIT_BOUND,
      sol,
    ),
    modelled,
  };
}
