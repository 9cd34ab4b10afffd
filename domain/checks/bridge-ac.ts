import { cToK, kToC } from "../physics/constants.js";
import type { Snapshot } from "../solve/ac-bridge-circuit.js";
import { integratePeriod } from "../solve/ac-bridge-period.js";
import type { PeriodIntegrals, PeriodOptions } from "../solve/ac-bridge-period-types.js";
import { fmt } from "../solve/electrical-point.js";
import { SEARCH_ABOVE_LIMIT_K } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { mirrorState, wholeFromHalf, wholeTraceFromHalf } from "../solve/ac-bridge-half-wave.js";
import { newtonPredictor, type PeriodMap, shootPeriodic } from "../solve/periodic-shooting.js";
import { SLOT } from "./bridge-ac-metrics.js";
import { validateAcModel } from "./bridge-ac-validate.js";
import { buildCircuit } from "./bridge-ac-laws.js";
import { BRIDGE_POSITIONS, type BridgePosition, elementRthKPerW, elementTjMaxC } from "./bridge-element.js";

import type { BridgeAcModel, BridgeAcOptions, BridgeAcOutcome } from "./bridge-ac-types.js";
import { halfWaveSymmetric, partKeys } from "./bridge-ac-part-keys.js";
import { steadyStateOf } from "./bridge-ac-steady-state.js";

export type {
  AcElementResult,
  AcSteadyState,
  BridgeAcModel,
  BridgeAcOptions,
  BridgeAcOutcome,
} from "./bridge-ac-types.js";

/**
 * Relative tolerance of the integrator's local error and of the shooting residual (7e-6: with
 * the off intervals in closed form, this holds every figure of the benchmark within 0.08 % of
 * the reference at fewer steps than 1e-5 took before).
 */
export const AC_RTOL = 7e-6;
/** Tolerance of the predictor's one coarse map (only its start value is used, never its results). */
const PREDICTOR_RTOL = 1e-3;
/**
 * The line current's error is held relative to this multiple of its peak (inductive bridges,
 * where the current is a state). Measured on bench/bridge-ac-vs-ngspice.ts (diode bridge, 2 mH):
 * at 2.5 the steps of the conduction pulse fall by a fifth while every compared figure stays
 * within 0.015 % of the 60-period reference (at 1: 0.016 %).
 */
const LINE_ERROR_SCALE = 2.5;
/**
 * Without inductance: tolerance of the line current's defect (ac-bridge-period.ts) relative to
 * the same current scale. Measured against the ideal capacitor-input rectifier (test/domain/
 * checks/bridge-ac-ideal-rectifier.test.ts), ωCRL = 10 and 100, Rs = 1e-6·RL, diode and 1 µΩ
 * channel elements: at 1e-2 the peak is within 0.09 %, at 3e-3 within 0.03 % (0.24 % at
 * ωCRL = 100), with 10-20 % more steps than without the check; the demo bridges' figures move
 * by less than 1e-5 at 3e-3. Without it the peak of a 1 µΩ bridge with no source resistance was
 * 72 % high (the first conduction step rang).
 */
const CURRENT_RTOL = 3e-3;
const THERMAL_TOL_K = 1e-3;
const THERMAL_MAX_ITER = 100;

export interface Isothermal {
  readonly ok: true;
  readonly x: readonly number[];
  readonly integrals: PeriodIntegrals;
  readonly trace: readonly Snapshot[];
  readonly end: readonly number[];
  /** Line-current scale of the integrator's error control, A (passed on in a warm start). */
  readonly lineScaleA: number;
  /** Change over one period of the energy in the capacitor and the inductance, J. */
  readonly storedJ: { readonly capacitorJ: number; readonly inductorJ: number };
  readonly iterations: number;
  readonly periods: number;
  readonly steps: number;
}
/** A start from a previous solution (the electrothermal loop): its state at t = 0 and current scale. */
export interface WarmStart {
  readonly x: readonly number[];
  readonly lineScaleA: number;
}
type IsoOutcome =
  | Isothermal
  | { readonly ok: false; readonly outcome: "load-collapse" | "no-periodic-steady-state"; readonly reason: string };

/**
 * Periodic steady state of the AC bridge with every junction held at the given temperature, K
 * (what a circuit simulator computes at a fixed temperature). Shooting (periodic-shooting.ts) on
 * the one-period map of the TR-BDF2 integrator (ac-bridge-period.ts).
 */
export function solveBridgeAcAt(
  m: BridgeAcModel,
  tjK: Readonly<Record<BridgePosition, number>>,
  warm?: WarmStart,
): IsoOutcome {
  const parts = partKeys(m, tjK);
  const circuit = buildCircuit(m, tjK, parts);
  const peakV = Math.SQRT2 * m.sourceRmsV;
  const inductive = m.leakageInductanceH > 0;
  const currentScaleA = loadScaleA(m.load, peakV);
  // The ripple is the smallest voltage the results resolve: ten times the textbook I/(2fC) (or
  // the peak, if smaller) scales the integrator's voltage error and the periodicity residual.
  const rippleV = Math.min(peakV, currentScaleA / (2 * m.frequencyHz * m.capacitanceF));
  const voltageScaleV = Math.min(peakV, 10 * rippleV);
  // A symmetric bridge repeats every half period (ac-bridge-half-wave.ts): shoot on the half map.
  const half = halfWaveSymmetric(parts);
  const coarse = {
    rtol: PREDICTOR_RTOL,
    voltageScaleV,
    currentScaleA,
    record: false,
    halfPeriod: half,
    jacobian: true,
  };
  const periodMap =
    (o: PeriodOptions): PeriodMap<{ integrals: PeriodIntegrals; trace: readonly Snapshot[]; steps: number }> =>
    (x, withJacobian) => {
      const r = integratePeriod(circuit, x, { ...o, jacobian: withJacobian });
      if (!r.ok) return { ok: false, reason: r.reason };
      const value = { integrals: r.integrals, trace: r.trace ?? [], steps: r.steps };
      // On the half map the end is mirrored, M·H(x), and so is its derivative's current row.
      const jacobian =
        half && r.jacobian !== undefined
          ? r.jacobian.map((row, i) => (i === 1 ? row.map((v) => -v) : row))
          : r.jacobian;
      return {
        ok: true,
        end: half ? mirrorState(r.end) : r.end,
        value,
        ...(jacobian === undefined ? {} : { jacobian }),
      };
    };
  // Start: the previous solution when warm (electrothermal loop), else one Newton step on the
  // map at a loose tolerance from 0.9·peak (a fraction of a fine period's steps; it lands inside
  // the fine map's quadratic basin, so the fine shooting typically needs two maps, not three).
  const guess = inductive ? [0.9 * peakV, 0] : [0.9 * peakV];
  const predicted = warm === undefined ? newtonPredictor(periodMap(coarse), guess) : undefined;
  const x0 = warm?.x ?? predicted?.x ?? guess;
  // The line current's error is held relative to its peak (from the predictor's map, or the
  // previous solution), the load current at the source peak being the floor: the current is a
  // state only with inductance, where its pulse peaks several times the load current.
  const lineScaleA = Math.max(currentScaleA, warm?.lineScaleA ?? predicted?.value?.integrals.lineMaxA ?? 0);
  const opt = {
    ...coarse,
    rtol: AC_RTOL,
    currentScaleA: LINE_ERROR_SCALE * lineScaleA,
    record: true,
    ...(inductive ? {} : { currentRtol: CURRENT_RTOL }),
  };
  const shot = shootPeriodic(
    periodMap(opt),
    x0,
    inductive ? [voltageScaleV, currentScaleA] : [voltageScaleV],
    10 * AC_RTOL,
  );
  if (!shot.ok) return { ok: false, outcome: shot.code, reason: shot.reason };
  const last = shot.value;
  const end = shot.x.map((v, j) => v + (shot.residual[j] ?? 0));
  // Energy stored over one period: a half period's change, twice, on the half map.
  const spans = half ? 2 : 1;
  const storedJ = {
    capacitorJ: spans * 0.5 * m.capacitanceF * ((end[0] ?? 0) ** 2 - (shot.x[0] ?? 0) ** 2),
    inductorJ: spans * 0.5 * m.leakageInductanceH * ((end[1] ?? 0) ** 2 - (shot.x[1] ?? 0) ** 2),
  };
  const period = 1 / m.frequencyHz;
  return {
    ok: true,
    x: shot.x,
    end,
    storedJ,
    integrals: half ? wholeFromHalf(last.integrals) : last.integrals,
    trace: half ? wholeTraceFromHalf(last.trace, period) : last.trace,
    lineScaleA,
    iterations: shot.iterations,
    // The predictor's coarse map counts as one (cheaper) map integrated.
    periods: (shot.periods + (warm === undefined ? 1 : 0)) / spans,
    steps: spans * last.steps,
  };
}

/**
 * AC bridge with a reservoir capacitor, electrothermally: the periodic steady state at the
 * junction temperatures, each element's Tj = Ta + RthJA·P̄ from its period-average loss (the
 * thermal time constants are long against a mains period, so the average sets Tj; the ripple of
 * Tj within a period is not computed), repeated by fixed-point iteration until the temperatures
 * settle. A loss that keeps rising with temperature past the junction limit + 150 K is thermal
 * runaway. Zero frequency, non-positive capacitance and the like are reported as invalid input; a
 * load the source cannot feed is load-collapse.
 */
export function analyseBridgeAc(m: BridgeAcModel, opts: BridgeAcOptions = {}): BridgeAcOutcome {
  const invalid = validateAcModel(m);
  if (invalid !== undefined) return { outcome: "invalid-input", ...invalid };
  const taK = cToK(m.ambientC);
  const temps: Record<BridgePosition, number> = { line1High: taK, line2High: taK, line1Low: taK, line2Low: taK };
  let warm: WarmStart | undefined;
  let periods = 0;
  for (let iter = 1; iter <= THERMAL_MAX_ITER; iter += 1) {
    const iso = solveBridgeAcAt(m, temps, warm);
    if (!iso.ok) return { outcome: iso.outcome, reason: iso.reason };
    periods += iso.periods;
    warm = { x: iso.x, lineScaleA: iso.lineScaleA };
    const period = 1 / m.frequencyHz;
    let maxDelta = 0;
    const next: Record<BridgePosition, number> = { ...temps };
    for (const p of BRIDGE_POSITIONS) {
      const e = m.elements[p];
      const lossW = (iso.integrals.elementEnergyJ[SLOT[p]] ?? 0) / period;
      const t = taK + elementRthKPerW(e) * lossW;
      const ceilingK = cToK(elementTjMaxC(e) + SEARCH_ABOVE_LIMIT_K);
      if (t > ceilingK) {
        return {
          outcome: "thermal-runaway",
          position: p,
          reason: `${p}: no stable junction temperature up to ${fmt(kToC(ceilingK))} °C; the loss (${fmt(lossW)} W) keeps the junction climbing`,
          searchedToC: kToC(ceilingK),
          lossAtSearchEndW: lossW,
        };
      }
      maxDelta = Math.max(maxDelta, Math.abs(t - temps[p]));
      next[p] = t;
    }
    if (maxDelta <= THERMAL_TOL_K) return finish(m, iso, temps, iter, periods, opts);
    Object.assign(temps, next);
  }
  return {
    outcome: "no-thermal-convergence",
    reason: `the junction temperatures did not settle within ${THERMAL_MAX_ITER} iterations (thermal loop gain close to 1)`,
  };
}

function finish(
  m: BridgeAcModel,
  iso: Isothermal,
  temps: Readonly<Record<BridgePosition, number>>,
  thermalIterations: number,
  periods: number,
  opts: BridgeAcOptions,
): BridgeAcOutcome {
  const steadyState = steadyStateOf(m, iso, temps, { thermalIterations, periods }, opts.waveformPoints);
  const hot = steadyState.elements.find((e) => e.tjC > e.tjMaxC);
  if (hot !== undefined) {
    return {
      outcome: "over-temperature",
      steadyState,
      reason: `${hot.position} runs at ${fmt(hot.tjC)} °C, above its ${fmt(hot.tjMaxC)} °C junction limit`,
    };
  }
  if (m.load.kind === "constant-power" && steadyState.outputMinV < m.load.minVoltageV) {
    return {
      outcome: "load-undervoltage",
      steadyState,
      reason: `the output dips to ${fmt(steadyState.outputMinV)} V, below the load's ${fmt(m.load.minVoltageV)} V minimum operating voltage`,
    };
  }
  return { outcome: "solved", steadyState };
}

/** A current scale for the error control: the load current at the source peak voltage. */
function loadScaleA(load: LoadModel, peakV: number): number {
  switch (load.kind) {
    case "resistive":
      return peakV / load.resistanceOhm;
    case "constant-current":
      return load.currentA;
    case "constant-power":
      return load.powerW / peakV;
  }
}
