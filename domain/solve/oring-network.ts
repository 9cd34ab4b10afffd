import { cToK, kToC } from "../physics/constants.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import type { StageModel } from "../stages/stage-model.js";
import type { LoadModel } from "./load-model.js";
import { bracketedRoot } from "./root-find.js";
import { type BranchState, branchCurrent } from "./series-branch.js";

export interface OringSource {
  readonly openCircuitV: number;
  /** Internal plus wiring resistance, ohm (> 0). */
  readonly internalResistanceOhm: number;
  /** Forward current limit of the source, A (absent: none). */
  readonly currentLimitA?: number;
  readonly stage: StageModel;
}

export interface OringModel {
  readonly sources: readonly OringSource[];
  readonly load: LoadModel;
  readonly ambientC: number;
}

export interface OringBranch extends BranchState {
  readonly tjC: number;
  /** Share of the total forward current, 0..1. */
  readonly share: number;
}

export type OringOutcome =
  | {
      readonly outcome: "solved";
      readonly nodeV: number;
      readonly loadCurrentA: number;
      readonly branches: readonly OringBranch[];
      /** Σ branch currents − load current, A. */
      readonly kclResidualA: number;
      readonly totalStageLossW: number;
      readonly totalResistanceLossW: number;
      readonly thermalIterations: number;
    }
  | { readonly outcome: "load-collapse"; readonly reason: string }
  | { readonly outcome: "no-sources"; readonly reason: string; readonly path: "sources" }
  | { readonly outcome: "thermal-runaway"; readonly reason: string; readonly lastTjC: readonly number[] };

/**
 * N sources, each behind its own stage, into one node with a load. At fixed junction
 * temperatures every branch current falls monotonically as the node voltage rises
 * (solve/series-branch.ts) and a constant-current or resistive load's current rises, so
 * f(V) = Σ I_k(V) − I_load(V) has one root: bracketed in [0, max Voc], refined by Illinois. A
 * constant-power load makes f non-monotone; the stable (highest-voltage) root is taken by
 * scanning down from max Voc. Electrothermal: Tj_k = Ta + Rth_k·P_k, iterated to a fixed point
 * (Picard); no convergence within the limit or a junction beyond 1000 °C is reported as runaway.
 */
export function solveOring(m: OringModel): OringOutcome {
  if (m.sources.length === 0)
    return { outcome: "no-sources", reason: "an ORing network needs at least one source", path: "sources" };
  const taK = cToK(m.ambientC);
  let tK = m.sources.map(() => taK);
  for (let iter = 1; iter <= 200; iter += 1) {
    const node = solveNode(m, tK);
    if (node === undefined)
      return { outcome: "load-collapse", reason: "the sources cannot hold any positive node voltage under this load" };
    const next = node.branches.map(
      (b, k) => taK + totalRthKPerW((m.sources[k] as OringSource).stage.thermal) * b.stageLossW,
    );
    const change = Math.max(...next.map((t, k) => Math.abs(t - (tK[k] ?? t))));
    if (next.some((t) => t > cToK(1000)))
      return {
        outcome: "thermal-runaway",
        reason: "a junction passes 1000 °C: no stable operating point",
        lastTjC: next.map(kToC),
      };
    if (change < 1e-7) {
      const fwd = node.branches.reduce((s, b) => s + Math.max(b.currentA, 0), 0);
      const branches = node.branches.map((b, k) => ({
        ...b,
        tjC: kToC(tK[k] ?? taK),
        share: fwd > 0 ? Math.max(b.currentA, 0) / fwd : 0,
      }));
      return {
        outcome: "solved",
        nodeV: node.v,
        loadCurrentA: node.loadA,
        branches,
        kclResidualA: branches.reduce((s, b) => s + b.currentA, 0) - node.loadA,
        totalStageLossW: branches.reduce((s, b) => s + b.stageLossW, 0),
        totalResistanceLossW: branches.reduce((s, b) => s + b.resistanceLossW, 0),
        thermalIterations: iter,
      };
    }
    tK = next;
  }
  return {
    outcome: "thermal-runaway",
    reason: "the junction temperatures do not settle (Picard iteration, 200 steps)",
    lastTjC: tK.map(kToC),
  };
}

export function loadCurrentA(load: LoadModel, v: number): number {
  switch (load.kind) {
    case "constant-current":
      return load.currentA;
    case "resistive":
      return v / load.resistanceOhm;
    case "constant-power":
      return load.powerW / v;
  }
}

function solveNode(
  m: OringModel,
  tK: readonly number[],
): { v: number; loadA: number; branches: BranchState[] } | undefined {
  const branchesAt = (v: number): BranchState[] =>
    m.sources.map((s, k) =>
      branchCurrent(s.stage, s.openCircuitV, s.internalResistanceOhm, v, 0, tK[k] ?? 300, s.currentLimitA),
    );
  const f = (v: number): number => branchesAt(v).reduce((acc, b) => acc + b.currentA, 0) - loadCurrentA(m.load, v);
  const top = Math.max(...m.sources.map((s) => s.openCircuitV));
  let hi = top;
  let fhi = f(top);
  let lo = 0;
  let flo = 0;
  if (m.load.kind === "constant-power") {
    // Scan down from the top for the first sign change (the stable, high-voltage root).
    let found = false;
    for (let k = 1; k < 2000 && !found; k += 1) {
      const v = top * (1 - k / 2000);
      const fv = f(v);
      if (fv >= 0) found = true;
      else {
        hi = v;
        fhi = fv;
      }
      lo = v;
      flo = fv;
    }
    if (!found) return undefined;
  } else {
    flo = f(0);
    if (flo < 0) return undefined;
  }
  const root = bracketedRoot(f, lo, hi, flo, fhi, 1e-15 * top, 600);
  const v = root.x;
  return { v, loadA: loadCurrentA(m.load, v), branches: branchesAt(v) };
}
