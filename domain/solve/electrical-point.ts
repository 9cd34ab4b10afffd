import type { ForwardState } from "../stages/conduction.js";
import { stageForward } from "../stages/forward.js";
import { type StageModel, stageQuiescentA } from "../stages/stage-model.js";
import type { LoadModel } from "./load-model.js";
import { bracketedRoot, goldenMax } from "./root-find.js";

export interface CircuitModel {
  readonly stage: StageModel;
  /** Open-circuit supply voltage, V (> 0: forward polarity). */
  readonly supplyV: number;
  /** Source and wiring resistance in series with the supply, ohm. */
  readonly sourceResistanceOhm: number;
  readonly load: LoadModel;
}

export interface ElectricalPoint {
  readonly currentA: number;
  /** Load current plus the stage's quiescent current, A. */
  readonly sourceCurrentA: number;
  /** Voltage at the stage's input terminal, V. */
  readonly stageInputV: number;
  readonly loadV: number;
  readonly forward: ForwardState;
}

export type ElectricalOutcome =
  | { readonly ok: true; readonly point: ElectricalPoint }
  | {
      readonly ok: false;
      readonly code: "load-collapse";
      readonly reason: string;
      readonly maxDeliverablePowerW?: number;
      readonly requestedPowerW?: number;
    }
  | { readonly ok: false; readonly code: "stage-off"; readonly reason: string; readonly stageInputV: number };

/** The circuit supply → source resistance → stage → load, solved at a fixed junction temperature. */
export function solveElectrical(c: CircuitModel, tK: number): ElectricalOutcome {
  const iq = stageQuiescentA(c.stage);
  const at = (currentA: number): ElectricalPoint => {
    const stageInputV = c.supplyV - (currentA + iq) * c.sourceResistanceOhm;
    const forward = stageForward(c.stage, currentA, tK, stageInputV);
    return { currentA, sourceCurrentA: currentA + iq, stageInputV, loadV: stageInputV - forward.dropV, forward };
  };
  const idle = at(0);
  if (idle.forward.mode === "off") {
    return { ok: false, code: "stage-off", reason: `the stage blocks at an input of ${fmt(idle.stageInputV)} V (below its start voltage): the load is unpowered`, stageInputV: idle.stageInputV };
  }
  if (!(idle.loadV > 0)) {
    return { ok: false, code: "load-collapse", reason: "the supply cannot even carry the stage's quiescent current" };
  }
  const load = c.load;
  switch (load.kind) {
    case "constant-current": {
      const p = at(load.currentA);
      if (p.forward.mode === "off") return stageOff(p);
      if (!(p.loadV > 0)) {
        return { ok: false, code: "load-collapse", reason: `the supply cannot drive ${fmt(load.currentA)} A: the load voltage would be ${fmt(p.loadV)} V` };
      }
      return { ok: true, point: p };
    }
    case "resistive": {
      const f = (i: number): number => at(i).loadV - i * load.resistanceOhm;
      const hi = c.supplyV / load.resistanceOhm;
      const root = bracketedRoot(f, 0, hi, f(0), f(hi), 1e-13 * hi);
      const p = at(root.x);
      if (p.forward.mode === "off") return stageOff(p);
      return { ok: true, point: p };
    }
    case "constant-power": {
      // The current at which the load voltage reaches zero bounds the search.
      let zeroA = Math.max(load.powerW / idle.loadV, 1e-6);
      for (let k = 0; k < 400 && at(zeroA).loadV > 0; k += 1) zeroA *= 2;
      const g = (i: number): number => i * at(i).loadV;
      const peak = goldenMax(g, 0, zeroA, 1e-10 * zeroA);
      if (peak.fx < load.powerW) {
        return {
          ok: false,
          code: "load-collapse",
          reason: `the supply path can deliver at most ${fmt(peak.fx)} W to the load, less than its ${fmt(load.powerW)} W`,
          maxDeliverablePowerW: peak.fx,
          requestedPowerW: load.powerW,
        };
      }
      // The stable (high-voltage) branch: the smaller current that delivers the power.
      const h = (i: number): number => g(i) - load.powerW;
      const root = bracketedRoot(h, 0, peak.x, h(0), h(peak.x), 1e-13 * zeroA);
      const p = at(root.x);
      if (p.forward.mode === "off") return stageOff(p);
      return { ok: true, point: p };
    }
  }
}

function stageOff(p: ElectricalPoint): ElectricalOutcome {
  return { ok: false, code: "stage-off", reason: `the stage blocks at an input of ${fmt(p.stageInputV)} V under load (below its start voltage)`, stageInputV: p.stageInputV };
}

export function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
