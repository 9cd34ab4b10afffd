import { cToK, kToC } from "../physics/constants.js";
import { type StageModel, stageTjMaxC } from "../stages/stage-model.js";
import { type CircuitModel, type ElectricalPoint, fmt, solveElectrical } from "./electrical-point.js";
import { bracketedRoot } from "./root-find.js";

export interface OperatingPointModel extends CircuitModel {
  readonly ambientC: number;
  /** Junction-to-ambient thermal resistance of the stage's mounting, K/W. */
  readonly rthKPerW: number;
}

export interface SolvedPoint extends ElectricalPoint {
  readonly tjC: number;
  /** Heat dissipated in the die that carries the load current, W. */
  readonly dieLossW: number;
  /** Rth·dP/dTj at the solution: below 1 is a stable operating point. */
  readonly thermalLoopGain: number;
  readonly iterations: number;
}

export type OperatingPointOutcome =
  | { readonly outcome: "solved"; readonly point: SolvedPoint }
  | { readonly outcome: "over-temperature"; readonly point: SolvedPoint; readonly tjMaxC: number; readonly reason: string }
  | { readonly outcome: "load-undervoltage"; readonly point: SolvedPoint; readonly minVoltageV: number; readonly reason: string }
  | {
      readonly outcome: "thermal-runaway";
      readonly reason: string;
      readonly evidence: { readonly searchedToC: number; readonly lossAtSearchEndW: number; readonly thermalLoopGainAtSearchEnd: number };
    }
  | { readonly outcome: "load-collapse"; readonly reason: string; readonly atJunctionC: number; readonly maxDeliverablePowerW?: number }
  | { readonly outcome: "stage-off"; readonly reason: string; readonly stageInputV: number };

/** How far above the junction limit the search for a stable point goes, K. */
export const SEARCH_ABOVE_LIMIT_K = 150;

/**
 * Steady-state electrothermal operating point: the lowest solution of Tj = Ta + Rth·P(Tj), where
 * P(Tj) comes from the circuit solved at Tj. A fixed point is stable where Rth·dP/dTj < 1
 * (h(T) = Ta + Rth·P(T) − T crosses zero from above). Starting at Ta, where h ≥ 0, the search
 * takes fixed-point and secant steps upward until h changes sign, then closes the bracket by
 * regula falsi; if h stays positive up to the limit + SEARCH_ABOVE_LIMIT_K, the loss grows faster
 * than the thermal path can shed it: thermal runaway.
 */
export function solveOperatingPoint(m: OperatingPointModel): OperatingPointOutcome {
  const taK = cToK(m.ambientC);
  const tjMaxC = stageTjMaxC(m.stage);
  const ceilingK = cToK(tjMaxC + SEARCH_ABOVE_LIMIT_K);
  let failure: OperatingPointOutcome | undefined;
  let evaluations = 0;

  const lossAt = (tK: number): { lossW: number; point: ElectricalPoint } | undefined => {
    evaluations += 1;
    const e = solveElectrical(m, tK);
    if (!e.ok) {
      if (failure === undefined) {
        failure =
          e.code === "stage-off"
            ? { outcome: "stage-off", reason: e.reason, stageInputV: e.stageInputV }
            : {
                outcome: "load-collapse",
                reason: e.reason,
                atJunctionC: kToC(tK),
                ...(e.maxDeliverablePowerW === undefined ? {} : { maxDeliverablePowerW: e.maxDeliverablePowerW }),
              };
      }
      return undefined;
    }
    return { lossW: dieLossW(m.stage, e.point), point: e.point };
  };
  const h = (tK: number): number => {
    const r = lossAt(tK);
    return r === undefined ? Number.NaN : taK + m.rthKPerW * r.lossW - tK;
  };

  let t = taK;
  let ht = h(t);
  if (failure) return failure;
  let rootK: number | undefined;
  if (ht <= 0) rootK = t;
  for (let step = 0; rootK === undefined && step < 200; step += 1) {
    let next = Math.min(t + ht, ceilingK);
    let hn = h(next);
    if (failure) return failure;
    if (hn > 0) {
      const slope = (hn - ht) / (next - t);
      if (slope < 0) {
        const secant = Math.min(next - hn / slope, ceilingK);
        if (secant > next) {
          t = next;
          ht = hn;
          next = secant;
          hn = h(next);
          if (failure) return failure;
        }
      }
    }
    if (hn <= 0) {
      rootK = bracketedRoot(h, t, next, ht, hn, 1e-9).x;
      if (failure) return failure;
      break;
    }
    if (next >= ceilingK) break;
    t = next;
    ht = hn;
  }

  if (rootK === undefined) {
    const end = lossAt(ceilingK);
    if (failure || end === undefined) return failure ?? runawayUnknown(ceilingK);
    return {
      outcome: "thermal-runaway",
      reason: `no stable operating point up to ${fmt(kToC(ceilingK))} °C: with ${fmt(m.rthKPerW)} K/W the loss rises faster with temperature than the thermal path can shed it`,
      evidence: { searchedToC: kToC(ceilingK), lossAtSearchEndW: end.lossW, thermalLoopGainAtSearchEnd: loopGain(m, lossAt, ceilingK) },
    };
  }
  const sol = lossAt(rootK);
  if (failure || sol === undefined) return failure ?? runawayUnknown(rootK);
  const gain = loopGain(m, lossAt, rootK);
  const point: SolvedPoint = { ...sol.point, tjC: kToC(rootK), dieLossW: sol.lossW, thermalLoopGain: gain, iterations: evaluations };
  if (point.tjC > tjMaxC) {
    return { outcome: "over-temperature", point, tjMaxC, reason: `the stable operating point, ${fmt(point.tjC)} °C, lies above the ${fmt(tjMaxC)} °C junction limit` };
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

/** Heat in the die carrying the load: conduction loss, plus an integrated switch's own supply. */
function dieLossW(stage: StageModel, p: ElectricalPoint): number {
  if (stage.kind === "integrated-switch") return p.forward.lossW + stage.quiescentA * Math.max(p.stageInputV, 0);
  return p.forward.lossW;
}

function loopGain(
  m: OperatingPointModel,
  lossAt: (tK: number) => { lossW: number } | undefined,
  tK: number,
): number {
  const d = 0.01;
  const a = lossAt(tK - d);
  const b = lossAt(tK + d);
  if (a === undefined || b === undefined) return 0;
  return (m.rthKPerW * (b.lossW - a.lossW)) / (2 * d);
}

function runawayUnknown(tK: number): OperatingPointOutcome {
  throw new Error(`unreachable: circuit solve vanished at ${tK} K without a recorded failure`);
}
