import type { ThermalPath } from "../physics/thermal-path.js";
import { cToK } from "../physics/constants.js";
import { solveElectrical } from "../solve/electrical-point.js";
import { dieLossW, solveOperatingPoint } from "../solve/electrothermal-point.js";
import type { LoadModel } from "../solve/load-model.js";
import { bracketedRoot } from "../solve/root-find.js";
import type { StageModel } from "../stages/stage-model.js";

export interface SizingCondition {
  readonly supplyV: number;
  readonly ambientC: number;
  readonly load: LoadModel;
  readonly sourceResistanceOhm: number;
  readonly stage: StageModel;
}

export type ThermalSizing =
  | {
      readonly outcome: "no-heatsink-needed";
      readonly maxTotalRthKPerW: number | "unbounded";
      readonly presentTotalRthKPerW: number;
    }
  | {
      readonly outcome: "heatsink-needed";
      readonly maxTotalRthKPerW: number;
      readonly maxSinkRthKPerW: number;
      readonly presentTotalRthKPerW: number;
    }
  | {
      readonly outcome: "better-path-needed";
      readonly maxTotalRthKPerW: number;
      readonly presentTotalRthKPerW: number;
      readonly reason: string;
    }
  | { readonly outcome: "impossible"; readonly reason: string };

/** Beyond this total thermal resistance the part is taken to need no thermal path at all, K/W. */
const RTH_CEILING = 10_000;

/**
 * The largest junction-to-ambient thermal resistance that holds the junction at targetC at every
 * given condition, with temperature-dependent loss (each trial solves the electrothermal point).
 * Tj rises monotonically with Rth, so the limit is bracketed and refined by regula falsi. With a
 * junction-case-sink path the answer is the largest θSA = Rth,max − θJC − θCS.
 */
export function thermalSizing(
  conditions: readonly SizingCondition[],
  path: ThermalPath,
  presentTotalRthKPerW: number,
  targetC: number,
): ThermalSizing {
  let limit = Number.POSITIVE_INFINITY;
  for (const c of conditions) {
    if (c.ambientC >= targetC) {
      return {
        outcome: "impossible",
        reason: `the ${c.ambientC} °C ambient alone reaches the ${targetC} °C junction target: no thermal path can hold it`,
      };
    }
    // Closed form: at the limit Tj = target, so Rth,max = (target − Ta)/P(target), with P the
    // circuit's loss solved at Tj = target — exact whenever target is the stable root there
    // (Rth·dP/dTj < 1). Otherwise (near runaway) the bracketed search below decides.
    const direct = directLimit(c, targetC);
    if (direct === "no-heat") continue;
    if (direct !== undefined) {
      limit = Math.min(limit, direct);
      continue;
    }
    const excess = (rth: number): number => {
      const r = solveOperatingPoint({
        stage: c.stage,
        supplyV: c.supplyV,
        sourceResistanceOhm: c.sourceResistanceOhm,
        load: c.load,
        ambientC: c.ambientC,
        rthKPerW: rth,
      });
      if ("point" in r) return r.point.tjC - targetC;
      return r.outcome === "thermal-runaway" ? 1e3 : Number.NaN;
    };
    let hi = Math.max(presentTotalRthKPerW, 1);
    let fHi = excess(hi);
    if (Number.isNaN(fHi)) continue; // no operating point at this condition: reported by the corners
    while (fHi < 0 && hi < RTH_CEILING) {
      hi *= 2;
      fHi = excess(hi);
    }
    if (fHi < 0) continue;
    const f0 = excess(0);
    if (!(f0 < 0)) {
      return {
        outcome: "impossible",
        reason: `even with zero thermal resistance the junction does not stay below ${targetC} °C at ${c.ambientC} °C ambient`,
      };
    }
    const root = bracketedRoot((r) => (Number.isNaN(excess(r)) ? 1e3 : excess(r)), 0, hi, f0, fHi, 1e-6 * hi);
    limit = Math.min(limit, root.x);
  }
  if (!Number.isFinite(limit))
    return { outcome: "no-heatsink-needed", maxTotalRthKPerW: "unbounded", presentTotalRthKPerW };
  if (presentTotalRthKPerW <= limit)
    return { outcome: "no-heatsink-needed", maxTotalRthKPerW: limit, presentTotalRthKPerW };
  if (path.kind === "junction-case-sink") {
    const sink = limit - path.rthJcKPerW - path.rthCsKPerW;
    if (sink <= 0) {
      return {
        outcome: "impossible",
        reason: `θJC + θCS = ${path.rthJcKPerW + path.rthCsKPerW} K/W already exceeds the ${limit.toFixed(3)} K/W the junction allows: even an ideal sink cannot hold it`,
      };
    }
    return { outcome: "heatsink-needed", maxTotalRthKPerW: limit, maxSinkRthKPerW: sink, presentTotalRthKPerW };
  }
  return {
    outcome: "better-path-needed",
    maxTotalRthKPerW: limit,
    presentTotalRthKPerW,
    reason: `the path needs at most ${limit.toFixed(2)} K/W junction-to-ambient (now ${presentTotalRthKPerW} K/W); give θJC and θCS to size a heatsink`,
  };
}

/** (target − Ta)/P(target) when target is a stable root there; "no-heat" when nothing dissipates. */
function directLimit(c: SizingCondition, targetC: number): number | "no-heat" | undefined {
  const loss = (tK: number): number | undefined => {
    const e = solveElectrical(c, tK);
    return e.ok ? dieLossW(c.stage, e.point) : undefined;
  };
  const tK = cToK(targetC);
  const p = loss(tK);
  if (p === undefined) return undefined;
  if (p <= 0) return "no-heat";
  const rth = (targetC - c.ambientC) / p;
  const lo = loss(tK - 0.01);
  const hi = loss(tK + 0.01);
  if (lo === undefined || hi === undefined) return undefined;
  const gain = (rth * (hi - lo)) / 0.02;
  return gain < 1 ? rth : undefined;
}
