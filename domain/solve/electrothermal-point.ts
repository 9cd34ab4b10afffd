import { kToC } from "../physics/constants.js";
import { behaviourOf, quiescentLossW } from "../stages/stage-behaviours.js";
import { type StageModel, stageStartV, stageTjMaxC } from "../stages/stage-model.js";
import {
  type CircuitModel,
  type ElectricalOutcome,
  type ElectricalPoint,
  fmt,
  solveElectrical,
} from "./electrical-point.js";
import { thermalFixedPoint } from "./thermal-fixed-point.js";

export interface OperatingPointModel extends CircuitModel {
  readonly ambientC: number;
  /** Junction-to-ambient thermal resistance of the stage's mounting, K/W. */
  readonly rthKPerW: number;
}

/** A solved electrothermal point without its loop gain (what the corners of a review report). */
export interface ThermalPoint extends ElectricalPoint {
  readonly tjC: number;
  /** Heat dissipated in the die that carries the load current, W. */
  readonly dieLossW: number;
  /** Circuit solves the search took. */
  readonly iterations: number;
  /** Present when the control's state is self-consistent neither way at this supply (see solve). */
  readonly startChatter?: StartChatter;
}

/**
 * The chatter band at a start threshold: running, the control's own current pulls its input below
 * the start voltage; below start, the input is at or above it. Neither state holds: a real
 * controller toggles between them (its hysteresis decides), and the point below start, the
 * lossier one, is reported.
 */
export interface StartChatter {
  readonly startV: number;
  /** Stage input with the control running, V (below startV). */
  readonly runningInputV: number;
  /** Stage input with the control below start, V (at or above startV). */
  readonly belowStartInputV: number;
}

export interface SolvedPoint extends ThermalPoint {
  /** Rth·dP/dTj at the solution: below 1 is a stable operating point. */
  readonly thermalLoopGain: number;
}

export type OperatingPointOutcome<P extends ThermalPoint = SolvedPoint> =
  | { readonly outcome: "solved"; readonly point: P }
  | { readonly outcome: "over-temperature"; readonly point: P; readonly tjMaxC: number; readonly reason: string }
  | { readonly outcome: "load-undervoltage"; readonly point: P; readonly minVoltageV: number; readonly reason: string }
  | {
      readonly outcome: "thermal-runaway";
      readonly reason: string;
      readonly evidence: {
        readonly searchedToC: number;
        readonly lossAtSearchEndW: number;
        readonly thermalLoopGainAtSearchEnd: number;
      };
    }
  | {
      readonly outcome: "load-collapse";
      readonly reason: string;
      readonly atJunctionC: number;
      readonly maxDeliverablePowerW?: number;
      /** Present when the stage's current limit starves the load: the limit it holds, A. */
      readonly currentLimitA?: number;
    }
  | { readonly outcome: "stage-off"; readonly reason: string; readonly stageInputV: number };

/** How far above the junction limit the search for a stable point goes, K. */
export const SEARCH_ABOVE_LIMIT_K = 150;

/**
 * Steady-state electrothermal operating point: the lowest stable solution of Tj = Ta + Rth·P(Tj)
 * (domain/solve/thermal-fixed-point.ts), with P(Tj) from the circuit solved at Tj. A stable point
 * above the junction limit is "over-temperature"; none up to the limit + SEARCH_ABOVE_LIMIT_K is
 * thermal runaway.
 */
export function solveOperatingPoint(m: OperatingPointModel): OperatingPointOutcome {
  const r = solve(m, true);
  if ("point" in r && !("thermalLoopGain" in r.point))
    throw new Error("unreachable: a probed root without its loop gain");
  return r as OperatingPointOutcome;
}

/**
 * solveOperatingPoint without the loop-gain probe: the same point, one circuit solve fewer, for
 * callers that do not report Rth·dP/dTj (the corners of a design review).
 */
export function solveThermalPoint(m: OperatingPointModel): OperatingPointOutcome<ThermalPoint> {
  return solve(m, false);
}

/**
 * A stage with a start voltage (a controller, an integrated switch): its control runs from that
 * voltage at its input, and the current it then lets through lowers the input by I·Rs. The state
 * of the control is settled once for the circuit: running where the running point keeps its own
 * input at or above the start voltage, else below start (body diode or off). Left to each trial
 * current, the mode flipped back and forth with the supply near the threshold, and the thermal
 * root sat on the jump between two losses (Tj off Ta + Rth·P by tenths of a kelvin). Near the
 * threshold a real controller may chatter; the point below start, the lossier one, is reported.
 */
function solve(m: OperatingPointModel, probeGain: boolean): OperatingPointOutcome<ThermalPoint> {
  const startV = stageStartV(m.stage);
  if (startV === undefined || m.running !== undefined) return solveWithControl(m, probeGain);
  const on = solveWithControl({ ...m, running: true }, probeGain);
  if ("point" in on && on.point.stageInputV >= startV) return on;
  const below = solveWithControl({ ...m, running: false }, probeGain);
  if ("point" in on) {
    if (!("point" in below) || below.point.stageInputV < startV) return below;
    return withChatter(below, {
      startV,
      runningInputV: on.point.stageInputV,
      belowStartInputV: below.point.stageInputV,
    });
  }
  // running has no point (runaway, collapse): it stands unless the control never starts
  return "point" in below && below.point.stageInputV < startV ? below : on;
}

function withChatter<P extends ThermalPoint>(
  o: Extract<OperatingPointOutcome<P>, { point: P }>,
  startChatter: StartChatter,
): OperatingPointOutcome<P> {
  return { ...o, point: { ...o.point, startChatter } };
}

function solveWithControl(m: OperatingPointModel, probeGain: boolean): OperatingPointOutcome<ThermalPoint> {
  const tjMaxC = stageTjMaxC(m.stage);
  // The search evaluates the root itself (then, when asked, probes +0.01 K for the loop gain):
  // keep the circuit solved at the root, the last or the second-to-last solve, in two slots.
  let lastK = Number.NaN;
  let lastE: ElectricalOutcome | undefined;
  let prevK = Number.NaN;
  let prevE: ElectricalOutcome | undefined;
  const r = thermalFixedPoint(
    m.ambientC,
    m.rthKPerW,
    tjMaxC + SEARCH_ABOVE_LIMIT_K,
    (tK) => {
      const e = solveElectrical(m, tK);
      prevK = lastK;
      prevE = lastE;
      lastK = tK;
      lastE = e;
      return e.ok ? { ok: true, lossW: dieLossW(m.stage, e.point) } : { ok: false, failure: e };
    },
    probeGain,
  );
  if (r.kind === "failed") {
    const e = r.failure;
    if (e.ok) throw new Error("unreachable: a failure that is ok");
    return e.code === "stage-off"
      ? { outcome: "stage-off", reason: e.reason, stageInputV: e.stageInputV }
      : {
          outcome: "load-collapse",
          reason: e.reason,
          atJunctionC: kToC(r.atK),
          ...(e.maxDeliverablePowerW === undefined ? {} : { maxDeliverablePowerW: e.maxDeliverablePowerW }),
          ...(e.currentLimitA === undefined ? {} : { currentLimitA: e.currentLimitA }),
        };
  }
  if (r.kind === "runaway") {
    return {
      outcome: "thermal-runaway",
      reason: `no stable operating point up to ${fmt(kToC(r.searchedToK))} °C: with ${fmt(m.rthKPerW)} K/W the loss rises faster with temperature than the thermal path can shed it`,
      evidence: {
        searchedToC: kToC(r.searchedToK),
        lossAtSearchEndW: r.lossAtEndW,
        thermalLoopGainAtSearchEnd: r.loopGainAtEnd,
      },
    };
  }
  const e = (r.tjK === lastK ? lastE : r.tjK === prevK ? prevE : undefined) ?? solveElectrical(m, r.tjK);
  if (!e.ok) throw new Error("unreachable: the circuit solved during the search but not at its root");
  // Fields named one by one: a spread plus extra fields takes V8's slow clone path (it was most
  // of this function's time); the key order is the spread's.
  const ep = e.point;
  const point: ThermalPoint | SolvedPoint =
    r.loopGain === undefined
      ? {
          currentA: ep.currentA,
          sourceCurrentA: ep.sourceCurrentA,
          stageInputV: ep.stageInputV,
          loadV: ep.loadV,
          forward: ep.forward,
          tjC: kToC(r.tjK),
          dieLossW: r.lossW,
          iterations: r.evaluations,
        }
      : {
          currentA: ep.currentA,
          sourceCurrentA: ep.sourceCurrentA,
          stageInputV: ep.stageInputV,
          loadV: ep.loadV,
          forward: ep.forward,
          tjC: kToC(r.tjK),
          dieLossW: r.lossW,
          thermalLoopGain: r.loopGain,
          iterations: r.evaluations,
        };
  if (point.tjC > tjMaxC) {
    return {
      outcome: "over-temperature",
      point,
      tjMaxC,
      reason: `the stable operating point, ${fmt(point.tjC)} °C, lies above the ${fmt(tjMaxC)} °C junction limit`,
    };
  }
  if (m.load.kind === "constant-power" && point.loadV < m.load.minVoltageV) {
    return {
      outcome: "load-undervoltage",
      point,
      minVoltageV: m.load.minVoltageV,
      reason: `the load sees ${fmt(point.loadV)} V, below its ${fmt(m.load.minVoltageV)} V minimum operating voltage`,
    };
  }
  return { outcome: "solved", point };
}

/** Heat in the die carrying the load: conduction loss, plus the quiescent power of a control on that die (an integrated switch). */
export function dieLossW(stage: StageModel, p: ElectricalPoint): number {
  return behaviourOf(stage).quiescentHeatsDie
    ? p.forward.lossW + quiescentLossW(stage, p.stageInputV)
    : p.forward.lossW;
}
