import type { TurnOffOutcome } from "./turn-off-event-types.js";
import {
  det2,
  holdPiece,
  gaussLegendreEach,
  type Linear2,
  loopSystem,
  outputV,
  type RlcLoop,
  releasedLoop,
  shiftLoop,
  slowestDecayPerS,
  stateAt,
  stateFrom,
  stateIntegral,
  type Vec2,
} from "../physics/rlc-series.js";
import type { LoadModel } from "../solve/load-model.js";

/**
 * How each load enters the loop: i_load = I + G·v_out.
 * constant-current: exact (I = load current, G = 0); resistive: exact (I = 0, G = 1/R);
 * constant-power: linearised on its tangent at the pre-event output V0 (I = 2P/V0, G = −P/V0²),
 * exact at V0 and accurate while the output stays near V0 (error ≈ P·(ΔV/V0)²/V0 in current).
 */
export function loadLine(load: LoadModel, v0: number): { currentA: number; conductanceS: number; method: string } {
  switch (load.kind) {
    case "constant-current":
      return { currentA: load.currentA, conductanceS: 0, method: "constant-current source term (exact)" };
    case "resistive":
      return {
        currentA: 0,
        conductanceS: 1 / load.resistanceOhm,
        method: "resistor in the second-order system (exact)",
      };
    case "constant-power":
      return {
        currentA: (2 * load.powerW) / v0,
        conductanceS: -load.powerW / (v0 * v0),
        method: "constant power linearised on its tangent at the pre-event output voltage",
      };
  }
}

export type DampingRegime = "under-damped" | "critically-damped" | "over-damped";

export interface LoopCharacter {
  readonly regime: DampingRegime;
  /** ζ = −m/√det(A); 1 for critical damping (a series R-L-C: ζ = (R/2)·√(C/L)). */
  readonly dampingRatio: number;
  /** Undamped natural frequency √det(A), rad/s. */
  readonly naturalRadPerS: number;
  /** Slowest decay rate of the natural response, 1/s. */
  readonly decayPerS: number;
}

export function loopCharacter(s: Linear2): LoopCharacter {
  const m = (s.a11 + s.a22) / 2;
  const d = det2(s);
  const q = m * m - d;
  const regime: DampingRegime =
    Math.abs(q) <= 1e-12 * Math.max(m * m, Math.abs(d)) ? "critically-damped" : q < 0 ? "under-damped" : "over-damped";
  const wn = Math.sqrt(Math.max(d, 0));
  return { regime, dampingRatio: wn > 0 ? -m / wn : 0, naturalRadPerS: wn, decayPerS: slowestDecayPerS(s) };
}

/** Energies over [0, t] of a loop phase, J. Dissipations by Gauss-Legendre on the closed form. */
export interface PhaseEnergies {
  readonly capacitorLostJ: number;
  readonly inductorLostJ: number;
  /** Energy the input source delivered into the loop: Vs·∫i dt (negative: it absorbed it). */
  readonly sourceDeliveredJ: number;
  readonly loopResistanceJ: number;
  readonly esrJ: number;
  readonly loadJ: number;
  /** Energy absorbed by a clamp voltage in the loop: Vcl·|∫i dt| (0 without a clamp). */
  readonly clampJ: number;
  /** (lost + delivered − dissipated − clamp) / lost: the energy-balance residual. */
  readonly balanceResidual: number;
}

/**
 * The energies of one phase of the loop from state x0 over [0, t]. `eventStoredJ` is the energy the
 * whole event started with (default: this phase's own start): the residual's floor is 1e-9 of it.
 */
export function phaseEnergies(p: RlcLoop, x0: Vec2, t: number, clampV: number, eventStoredJ = 0): PhaseEnergies {
  if (p.hold !== undefined) return heldEnergies(p, x0, t, clampV, eventStoredJ);
  const s = loopSystem(p);
  const x = stateAt(s, x0, t);
  const q = stateIntegral(s, x0, t);
  const decay = p.sourceDecay;
  // A decaying source's rate 1/τ joins the loop's in the panel density.
  const segments = quadratureSegments(s, t, decay === undefined ? 0 : 1 / decay.tauS);
  const rLoop = p.loopResistanceOhm;
  const loadA = (xs: Vec2): number => p.loadCurrentA + p.loadConductanceS * outputV(p, xs);
  // The dissipations in the loop resistance, the ESR and the load, and a decaying source's
  // ΔV·∫e^(−t/τ)·i dt (the clamp is part of sourceV in the loop equations; its term is split out
  // below), by Gauss-Legendre on the closed form: one evaluation of the state a node for all four.
  const state = stateFrom(s, x0);
  const integrands = (tt: number, out: number[]): void => {
    const xs = state(tt);
    const ic = xs[0] - loadA(xs);
    out[0] = rLoop * xs[0] * xs[0];
    out[1] = p.esrOhm * ic * ic;
    out[2] = outputV(p, xs) * loadA(xs);
    if (decay !== undefined) out[3] = decay.extraV * Math.exp(-tt / decay.tauS) * xs[0];
  };
  const totals = [0, 0, 0, 0];
  for (const [a, b, n] of segments) {
    const part = gaussLegendreEach(integrands, a, b, n, decay === undefined ? 3 : 4);
    part.forEach((v, k) => {
      totals[k] = (totals[k] ?? 0) + v;
    });
  }
  const [loopResistanceJ = 0, esrJ = 0, loadJ = 0, decayingJ = 0] = totals;
  const capacitorLostJ = 0.5 * p.capacitanceF * (x0[1] * x0[1] - x[1] * x[1]);
  const inductorLostJ = 0.5 * p.inductanceH * (x0[0] * x0[0] - x[0] * x[0]);
  const sourceDeliveredJ = (p.sourceV - clampV) * q[0] + decayingJ;
  const clampJ = -clampV * q[0];
  const lost = capacitorLostJ + inductorLostJ + sourceDeliveredJ;
  const used = loopResistanceJ + esrJ + loadJ + clampJ;
  // Relative to the energies exchanged, and to no less than 1e-9 of the energy stored at the
  // start (of the event, where a later phase is given it): a phase of zero length, or a clamp
  // phase of a current at rounding level (1e-16 J of a 1e-4 J event), exchanges only the rounding
  // of ½·C·V² and of its end's location, and a residual relative to that alone would be 1e-2 to
  // 1e20, meaning nothing for the event.
  const stored = Math.max(0.5 * p.capacitanceF * x0[1] * x0[1] + 0.5 * p.inductanceH * x0[0] * x0[0], eventStoredJ);
  const scale = Math.max(
    Math.abs(capacitorLostJ) + Math.abs(inductorLostJ) + Math.abs(sourceDeliveredJ),
    1e-9 * stored,
    1e-300,
  );
  return {
    capacitorLostJ,
    inductorLostJ,
    sourceDeliveredJ,
    loopResistanceJ,
    esrJ,
    loadJ,
    clampJ,
    balanceResidual: (lost - used) / scale,
  };
}

/**
 * A held start's energies: each piece's (the hold to its release, the released loop after), the
 * state carried across, summed; the residual of the sums against the energy stored at the start.
 */
function heldEnergies(p: RlcLoop, x0: Vec2, t: number, clampV: number, eventStoredJ: number): PhaseEnergies {
  const untilS = p.hold?.untilS ?? 0;
  const stored = Math.max(0.5 * p.capacitanceF * x0[1] * x0[1] + 0.5 * p.inductanceH * x0[0] * x0[0], eventStoredJ);
  const held = holdPiece(p);
  const first = phaseEnergies(held, x0, Math.min(t, untilS), clampV, stored);
  if (!(t > untilS)) return first;
  const xB = stateAt(loopSystem(held), x0, untilS);
  const later = phaseEnergies(shiftLoop(releasedLoop(p), untilS), xB, t - untilS, clampV, stored);
  const sum = (k: Exclude<keyof PhaseEnergies, "balanceResidual">) => first[k] + later[k];
  const e = {
    capacitorLostJ: sum("capacitorLostJ"),
    inductorLostJ: sum("inductorLostJ"),
    sourceDeliveredJ: sum("sourceDeliveredJ"),
    loopResistanceJ: sum("loopResistanceJ"),
    esrJ: sum("esrJ"),
    loadJ: sum("loadJ"),
    clampJ: sum("clampJ"),
  };
  const lost = e.capacitorLostJ + e.inductorLostJ + e.sourceDeliveredJ;
  const used = e.loopResistanceJ + e.esrJ + e.loadJ + e.clampJ;
  const scale = Math.max(
    Math.abs(first.capacitorLostJ) + Math.abs(first.inductorLostJ) + Math.abs(first.sourceDeliveredJ),
    Math.abs(later.capacitorLostJ) + Math.abs(later.inductorLostJ) + Math.abs(later.sourceDeliveredJ),
    1e-9 * stored,
    1e-300,
  );
  return { ...e, balanceResidual: (lost - used) / scale };
}

/**
 * Gauss-Legendre segments [a, b, panels] over [0, t] for the dissipation integrals: one range
 * with panels for the fastest time scale (4 per unit of t·rate, at most 50,000), as long as that
 * cap does not bind. A stiff over-damped loop (a fast mode that dies within a sliver of a long
 * window) breaks the cap: there the fast mode is resolved on ranges doubling from 1/|λfast| to
 * 64/|λfast| (e^-64: gone), and the rest at the slow mode's density.
 */
function quadratureSegments(s: Linear2, t: number, extraRate = 0): readonly (readonly [number, number, number])[] {
  const rate = Math.abs(s.a11) + Math.abs(s.a22) + Math.sqrt(Math.abs(det2(s))) + extraRate;
  const panels = (len: number, density: number) => Math.min(50_000, Math.ceil(200 + 4 * len * density));
  const m = (s.a11 + s.a22) / 2;
  const q = m * m - det2(s);
  if (4 * t * rate <= 50_000 - 200 || !(q > 0)) return [[0, t, panels(t, rate)]];
  const fast = Math.abs(m - Math.sqrt(q));
  const slow = Math.abs(m + Math.sqrt(q));
  const out: [number, number, number][] = [];
  let a = 0;
  for (let b = 1 / fast; a < t; b *= 2) {
    const end = b >= 64 / fast ? t : Math.min(b, t);
    out.push([a, end, panels(end - a, end <= 64 / fast ? fast + slow : slow)]);
    a = end;
  }
  return out;
}

/** The loop's unstable outcome, if it is (each piece of a held start is checked). */
export function unstableLoop(
  s: Linear2,
  conductanceS: number,
): Extract<TurnOffOutcome, { outcome: "unstable-loop" }> | undefined {
  // A constant-power load is a negative incremental resistance −V²/P: its tangent can make the
  // linearised loop unstable, by a real mode (det A ≤ 0: R·P/V² ≥ 1) or by negative damping
  // (trace A > 0: P/V² > C·(R + ESR)/L, the negative-resistance oscillator; common practice for
  // a converter input behind an L-C). No bounded response exists to report: its own outcome.
  // At the real-mode boundary (det A → 0+) the slow mode's decay vanishes and the closed form is
  // rounding (energy balances of 0.6-1000 within 1e-15 of it): det A within 0.1 % of |a12·a21|
  // (R·P/V² ≥ 0.999 with no ESR) counts as diverging, as the ESR's edge above.
  const ch = loopCharacter(s);
  const diverges = !(det2(s) > 1e-3 * Math.abs(s.a12 * s.a21));
  if (diverges || ch.dampingRatio < 0) {
    const rNeg = conductanceS < 0 ? 1 / conductanceS : 0;
    const m2 = (s.a11 + s.a22) / 2;
    const growthPerS = diverges ? Math.max(0, m2 + Math.sqrt(Math.max(m2 * m2 - det2(s), 0))) : m2;
    const reason = diverges
      ? `the constant-power load's incremental resistance ${rNeg.toPrecision(4)} ohm outweighs the loop resistance, or comes within 0.1 % of it (R·P/V² >= 0.999 without ESR): the linearised loop diverges (growth ${growthPerS.toPrecision(3)} 1/s) and the output collapses`
      : `the constant-power load's incremental resistance ${rNeg.toPrecision(4)} ohm gives the linearised loop negative damping (damping ratio ${ch.dampingRatio.toPrecision(3)}: P/V^2 > C·(R + ESR)/L): its oscillation grows at ${growthPerS.toPrecision(3)} 1/s, so there is no bounded response to report; damp the input filter (more loop resistance or ESR, less inductance or more capacitance)`;
    return {
      outcome: "unstable-loop",
      reason,
      mode: diverges ? "diverges" : "oscillation-grows",
      dampingRatio: diverges ? 0 : ch.dampingRatio,
      growthPerS,
      loadIncrementalResistanceOhm: rNeg,
    };
  }
  return undefined;
}
