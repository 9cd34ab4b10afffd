import type { ForwardState } from "../stages/conduction.js";
import { stageForward } from "../stages/forward.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
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
  /** Whether the stage's control runs, fixed for the solve (absent: from its input voltage at each trial current). */
  readonly running?: boolean;
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
      /** Present when the stage's current limit starves the load: the limit it holds, A. */
      readonly currentLimitA?: number;
    }
  | { readonly ok: false; readonly code: "stage-off"; readonly reason: string; readonly stageInputV: number };

/**
 * The circuit supply → source resistance → stage → load, solved at a fixed junction temperature,
 * with the stage's own protections where its behaviour has them (integrated-switch.ts): above its
 * overvoltage cut-off, judged at its input with the path open (the state an open switch holds), it
 * is open and the load unpowered; where the load would draw more than its current limit, the
 * current is held at the limit and the load sets its own voltage there, I_lim·R for a resistive
 * load. A constant-current or constant-power load that needs more than the limit has no operating
 * point: its voltage collapses (a constant-power load's draw P/V only rises as V falls).
 */
export function solveElectrical(c: CircuitModel, tK: number): ElectricalOutcome {
  const b = behaviourOf(c.stage);
  const iq = stageQuiescentA(c.stage);
  const cutoffV = b.cutoffV?.(c.stage);
  if (cutoffV !== undefined) {
    const open = pointAt(c, iq, 0, tK);
    if (open.forward.mode === "cut-off") {
      return {
        ok: false,
        code: "stage-off",
        reason: `the switch's input, ${fmt(open.stageInputV)} V, is above its ${fmt(cutoffV)} V overvoltage cut-off: the switch is open and the load unpowered`,
        stageInputV: open.stageInputV,
      };
    }
  }
  const free = solvePath(c, iq, tK);
  const limitA = b.currentLimitA?.(c.stage);
  if (limitA === undefined || !free.ok || !(free.point.currentA > limitA)) return free;
  const mode = free.point.forward.mode;
  if (mode === "body-diode" || mode === "junction") return free; // below start: the control, and its limit, not running
  if (c.load.kind !== "resistive") {
    return {
      ok: false,
      code: "load-collapse",
      reason: `the load needs ${fmt(free.point.currentA)} A, above the switch's ${fmt(limitA)} A current limit: the switch holds ${fmt(limitA)} A and the load voltage collapses`,
      currentLimitA: limitA,
    };
  }
  const stageInputV = c.supplyV - (limitA + iq) * c.sourceResistanceOhm;
  const loadV = limitA * c.load.resistanceOhm;
  const atLimit = b.atCurrentLimit;
  if (atLimit === undefined) throw new Error("solveElectrical: a stage with a current limit but no state at it");
  const forward = atLimit(c.stage, tK, stageInputV, loadV);
  return { ok: true, point: { currentA: limitA, sourceCurrentA: limitA + iq, stageInputV, loadV, forward } };
}

/** The circuit with the stage's forward law as it is, no current limit. */
function solvePath(c: CircuitModel, iq: number, tK: number): ElectricalOutcome {
  const load = c.load;
  if (load.kind === "constant-current") {
    // The hot path of every corner: one point, no closure.
    const p = pointAt(c, iq, load.currentA, tK);
    if (p.forward.mode === "off" || p.forward.mode === "cut-off") return stageOff(p);
    if (!(p.loadV > 0)) {
      return {
        ok: false,
        code: "load-collapse",
        reason: `the supply cannot drive ${fmt(load.currentA)} A: the load voltage would be ${fmt(p.loadV)} V`,
      };
    }
    return { ok: true, point: p };
  }
  const at = (currentA: number): ElectricalPoint => pointAt(c, iq, currentA, tK);
  const idle = at(0);
  if (idle.forward.mode === "off" || idle.forward.mode === "cut-off") {
    return {
      ok: false,
      code: "stage-off",
      reason: `the stage blocks at an input of ${fmt(idle.stageInputV)} V (below its start voltage): the load is unpowered`,
      stageInputV: idle.stageInputV,
    };
  }
  if (!(idle.loadV > 0)) {
    return { ok: false, code: "load-collapse", reason: "the supply cannot even carry the stage's quiescent current" };
  }
  if (load.kind === "resistive") {
    // Fixed point I ← V(I)/R: contracts with ratio (source + stage slope)/R, fast for a real load;
    // a bracketed regula falsi on V(I) − I·R (decreasing in I) takes over otherwise.
    const fast = fixedPoint((i) => Math.max(at(i).loadV, 0) / load.resistanceOhm, idle.loadV / load.resistanceOhm);
    if (fast !== undefined) return finish(at(fast));
    const f = (i: number): number => at(i).loadV - i * load.resistanceOhm;
    const hi = c.supplyV / load.resistanceOhm;
    return finish(at(bracketedRoot(f, 0, hi, f(0), f(hi), 1e-13 * hi).x));
  }
  // Constant power: the stable (high-voltage) branch is the fixed point of I ← P/V(I) reached
  // from below; it exists iff the power the path can deliver, max I·V(I), reaches P.
  const fast = fixedPoint((i) => {
    const v = at(i).loadV;
    return v > 0 ? load.powerW / v : Number.NaN;
  }, load.powerW / idle.loadV);
  // Accept it only on the rising side of I·V(I): the stable branch, not the far root.
  if (fast !== undefined && fast * (1 + 1e-6) * at(fast * (1 + 1e-6)).loadV > fast * at(fast).loadV)
    return finish(at(fast));
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
  const h = (i: number): number => g(i) - load.powerW;
  return finish(at(bracketedRoot(h, 0, peak.x, h(0), h(peak.x), 1e-13 * zeroA).x));
}

/** The circuit at a load current: the source drop sets the stage's input, the stage its drop. */
function pointAt(c: CircuitModel, iq: number, currentA: number, tK: number): ElectricalPoint {
  const stageInputV = c.supplyV - (currentA + iq) * c.sourceResistanceOhm;
  const forward = stageForward(c.stage, currentA, tK, stageInputV, c.running);
  return { currentA, sourceCurrentA: currentA + iq, stageInputV, loadV: stageInputV - forward.dropV, forward };
}

function finish(p: ElectricalPoint): ElectricalOutcome {
  return p.forward.mode === "off" || p.forward.mode === "cut-off" ? stageOff(p) : { ok: true, point: p };
}

/**
 * Iterate x ← f(x) from x0 with Aitken's Δ² acceleration every third step; the result when it
 * settles to 1e-12 relative within 60 steps, undefined when it diverges or stalls.
 */
function fixedPoint(f: (x: number) => number, x0: number): number | undefined {
  let x = x0;
  for (let k = 0; k < 60; k += 1) {
    const x1 = f(x);
    if (!Number.isFinite(x1) || x1 < 0) return undefined;
    if (Math.abs(x1 - x) <= 1e-12 * Math.max(x1, 1e-12)) return x1;
    const x2 = f(x1);
    if (!Number.isFinite(x2) || x2 < 0) return undefined;
    if (Math.abs(x2 - x1) <= 1e-12 * Math.max(x2, 1e-12)) return x2;
    const d = x2 - 2 * x1 + x;
    const accel = d !== 0 ? x - ((x1 - x) * (x1 - x)) / d : x2;
    x = Number.isFinite(accel) && accel >= 0 ? accel : x2;
  }
  return undefined;
}

function stageOff(p: ElectricalPoint): ElectricalOutcome {
  return {
    ok: false,
    code: "stage-off",
    reason: `the stage blocks at an input of ${fmt(p.stageInputV)} V under load (below its start voltage)`,
    stageInputV: p.stageInputV,
  };
}

export function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
