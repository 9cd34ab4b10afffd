import { type FitQuality, fitQuality } from "../fit/fit-quality.js";
import { leastSquares } from "../fit/least-squares.js";
import { thermalVoltageV } from "./constants.js";
import { type DiodeParams, diodeVoltageV } from "./diode.js";

/** One datasheet point of the forward characteristic. */
export interface ForwardPoint {
  readonly currentA: number;
  readonly voltageV: number;
  readonly tempK: number;
}

export interface DiodeFitOptions {
  readonly energyGapEv: number;
  readonly saturationTempExponent: number;
  readonly nominalTempK: number;
  /** With two points: the series resistance to hold fixed (default 0). */
  readonly seriesResistanceOhm?: number;
  /** A linear Vf temperature coefficient instead of the Eg/XTI law, V/K. */
  readonly linearTempCoVPerK?: number;
  /**
   * With four points or more at two or more temperatures: fit Eg too (XTI held). The caller
   * passes false where Eg or a linear coefficient was given.
   */
  readonly fitEnergyGap?: boolean;
  /**
   * Fit a linear Vf temperature coefficient (the linear law of diode.ts) instead of holding the
   * Eg/XTI law: needs four points or more over two temperatures or more; linearTempCoVPerK absent.
   */
  readonly fitLinearTempCo?: boolean;
}

/** The bounds of a fitted linear Vf temperature coefficient, V/K (those the diode contract holds a given one to). */
export const LINEAR_TEMP_CO_BOUNDS_V_PER_K = [-0.05, 0.05] as const;

/** The bound on a forward fit's worst residual: 2 % of the point's Vf (issue 23's gate). */
export const VF_FIT_BOUND = 0.02;

export type DiodeFitResult =
  | {
      readonly ok: true;
      readonly params: DiodeParams;
      readonly maxResidualV: number;
      /** True when the points determine the parameters exactly (two or three points). */
      readonly exact: boolean;
      /** Which parameters were fitted (the others held). */
      readonly fitted: readonly (
        | "saturationCurrentA"
        | "ideality"
        | "seriesResistanceOhm"
        | "energyGapEv"
        | "linearTempCoVPerK"
      )[];
      readonly quality: FitQuality;
      /** Standard errors (least-squares fits only): ln Is (a relative error of Is), n, Rs in ohm, Eg in eV, the linear coefficient in V/K. */
      readonly standardErrors: {
        readonly lnSaturationCurrent?: number;
        readonly ideality?: number;
        readonly seriesResistanceOhm?: number;
        readonly energyGapEv?: number;
        readonly linearTempCoVPerK?: number;
      };
      /** Modelled Vf at each point, in the caller's order. */
      readonly modelledV: readonly number[];
    }
  | { readonly ok: false; readonly code: "fit-failed"; readonly message: string; readonly points: readonly number[] };

const fail = (message: string, points: readonly number[] = []): DiodeFitResult => ({
  ok: false,
  code: "fit-failed",
  message,
  points,
});

/**
 * Points a Shockley diode with Rs ≥ 0 cannot follow, whatever its parameters: at one temperature
 * its Vf rises strictly with current (dV/dI = n·Vt/(I + Is) + Rs > 0). Returns the offending pair
 * (indices in the caller's order) and a reason, or undefined.
 */
export function unfollowableForward(
  points: readonly ForwardPoint[],
): { readonly points: readonly number[]; readonly reason: string } | undefined {
  const byTemp = new Map<number, number[]>();
  points.forEach((p, i) => {
    byTemp.set(p.tempK, [...(byTemp.get(p.tempK) ?? []), i]);
  });
  for (const [tK, idx] of byTemp) {
    const sorted = [...idx].sort((a, b) => (points[a]?.currentA ?? 0) - (points[b]?.currentA ?? 0));
    for (let k = 1; k < sorted.length; k += 1) {
      const a = points[sorted[k - 1] ?? 0];
      const b = points[sorted[k] ?? 0];
      if (a && b && !(b.voltageV > a.voltageV)) {
        const pair = [sorted[k - 1] ?? 0, sorted[k] ?? 0];
        return {
          points: pair,
          reason:
            `at ${(tK - 273.15).toFixed(1)} °C the forward voltage does not rise with current between points ${pair[0]} ` +
            `(${a.currentA} A, ${a.voltageV} V) and ${pair[1]} (${b.currentA} A, ${b.voltageV} V): no diode law follows that`,
        };
      }
    }
  }
  return undefined;
}

/**
 * Fit the Shockley parameters to forward points (I, Vf, T).
 * Two points give Is and n (Rs held, default 0); three give Is, n and Rs, exactly (a square
 * system, solved by damped Newton in the fitting core, as this fit always was). Four or more give
 * Is, n, Rs by bounded least squares (Levenberg–Marquardt; n in 0.5..10, Rs in 0..1 kohm), and
 * Eg as well (XTI held, 0.1..5 eV) when they span two or more temperatures and opts.fitEnergyGap;
 * or, with opts.fitLinearTempCo, the linear Vf temperature coefficient (−50..50 mV/K) in Eg's place,
 * which needs four points or more over two temperatures or more (refused otherwise: one
 * temperature says nothing of how Vf moves with it).
 * Points at other temperatures are carried through the SPICE Is(T) law (diode.ts). Refused: a
 * curve whose Vf does not rise with current (with the offending points), and exact fits that imply
 * a non-physical parameter (negative Rs, n outside 0.5..10). The 2 % gate is the caller's to apply
 * (`quality`), so that a caller may accept a worse fit explicitly.
 */
export function fitDiode(points: readonly ForwardPoint[], opts: DiodeFitOptions): DiodeFitResult {
  if (points.length < 2) return fail("a fit needs two points or more");
  const bad = unfollowableForward(points);
  if (bad !== undefined) return fail(bad.reason, bad.points);
  const exact = points.length <= 3;
  const fitRs = points.length >= 3;
  const temps = new Set(points.map((p) => p.tempK));
  const fitTc = opts.fitLinearTempCo === true && opts.linearTempCoVPerK === undefined;
  if (fitTc && (exact || temps.size < 2))
    return fail(
      `a linear Vf temperature coefficient is fitted from four points or more at two temperatures or more (${points.length} points at ${temps.size} temperature${temps.size === 1 ? "" : "s"} given): add points at another temperature, or give vfTempCoVPerK`,
    );
  const fitEg =
    !fitTc && !exact && temps.size >= 2 && opts.fitEnergyGap === true && opts.linearTempCoVPerK === undefined;
  const tcOf = (u: readonly number[]) => (fitTc ? (u[3] ?? 0) : opts.linearTempCoVPerK);
  // Exact fits sort the points by current (the order their Newton solve has always used).
  const order = exact ? [...points].sort((a, b) => a.currentA - b.currentA) : [...points];
  const p0 = [...points].sort((a, b) => a.currentA - b.currentA)[0];
  const pN = [...points].sort((a, b) => a.currentA - b.currentA)[points.length - 1];
  if (p0 === undefined || pN === undefined) throw new Error("unreachable: ≥ 2 points");

  const build = (u: readonly number[]): DiodeParams => ({
    saturationCurrentA: Math.exp(u[0] ?? 0),
    ideality: u[1] ?? 1,
    seriesResistanceOhm: fitRs ? (u[2] ?? 0) : (opts.seriesResistanceOhm ?? 0),
    energyGapEv: fitEg ? (u[3] ?? opts.energyGapEv) : opts.energyGapEv,
    saturationTempExponent: opts.saturationTempExponent,
    nominalTempK: opts.nominalTempK,
    ...(tcOf(u) === undefined ? {} : { linearTempCoVPerK: tcOf(u) }),
  });
  const residuals = (u: readonly number[]): number[] => {
    const p = build(u);
    return order.map((pt) => diodeVoltageV(p, pt.currentA, pt.tempK) - pt.voltageV);
  };

  // Starting point: n from the end points (log slope), Is from the lowest point.
  const vt = thermalVoltageV(p0.tempK);
  const lnRatio = Math.log(pN.currentA / p0.currentA);
  let n0 = (pN.voltageV - p0.voltageV) / (vt * lnRatio);
  if (!Number.isFinite(n0) || n0 < 0.6) n0 = 1.2;
  if (n0 > 8) n0 = 8;
  const start: number[] = [Math.log(p0.currentA) - p0.voltageV / (n0 * vt), n0];
  if (fitRs) start.push(0);
  if (fitEg) start.push(opts.energyGapEv);
  // The linear coefficient starts at −2 mV/K (silicon's usual figure, memory), inside its bounds.
  if (fitTc) start.push(-0.002);
  const free = Number.NEGATIVE_INFINITY;
  const sol = leastSquares({
    residuals,
    start,
    // Exact fits: n > 0.05 keeps the Newton trial points feasible (their only limit, as before).
    lower: exact ? [free, 0.05, free] : [Math.log(1e-30), 0.5, 0, fitTc ? LINEAR_TEMP_CO_BOUNDS_V_PER_K[0] : 0.1],
    upper: exact ? [] : [0, 10, 1e3, fitTc ? LINEAR_TEMP_CO_BOUNDS_V_PER_K[1] : 5],
  });
  if (sol.outcome !== "solved") return fail(sol.reason);
  const params = build(sol.params);
  const r = sol.residuals;
  const maxResidualV = Math.max(...r.map(Math.abs));
  if (exact) {
    if (!(maxResidualV < 1e-6))
      return fail(`no diode law passes through the points (residual ${maxResidualV.toExponential(2)} V)`);
    if (params.ideality < 0.5 || params.ideality > 10)
      return fail(`the points imply an ideality factor of ${params.ideality.toFixed(3)}, outside 0.5..10`);
    if (params.seriesResistanceOhm < 0) {
      return fail(
        `the points imply a negative series resistance (${params.seriesResistanceOhm.toExponential(3)} ohm): the curve bends the wrong way`,
      );
    }
  }
  const modelledV = points.map((pt) => diodeVoltageV(params, pt.currentA, pt.tempK));
  const se = sol.standardErrors;
  const fitted = (
    ["saturationCurrentA", "ideality", "seriesResistanceOhm", fitTc ? "linearTempCoVPerK" : "energyGapEv"] as const
  ).slice(0, start.length);
  return {
    ok: true,
    params,
    maxResidualV,
    exact,
    fitted,
    quality: fitQuality(
      modelledV,
      points.map((p) => p.voltageV),
      VF_FIT_BOUND,
      sol,
    ),
    standardErrors: {
      ...(se[0] === undefined ? {} : { lnSaturationCurrent: se[0] }),
      ...(se[1] === undefined ? {} : { ideality: se[1] }),
      ...(se[2] === undefined ? {} : { seriesResistanceOhm: se[2] }),
      ...(se[3] === undefined ? {} : fitTc ? { linearTempCoVPerK: se[3] } : { energyGapEv: se[3] }),
    },
    modelledV,
  };
}
