import { bisect } from "../physics/rlc-piece.js";
import {
  extremaTimes,
  type HeldStart,
  loopSystem,
  type RlcLoop,
  slowestDecayPerS,
  sourceAt,
  stateAt,
  type Vec2,
} from "../physics/rlc-series.js";

/**
 * A clamp at the loop's input node (a TVS across the input ahead of the stage) that keeps the
 * input from falling below levelV: v = levelV − dynamicOhm·j while it carries j ≥ 0 (breakdown
 * and dynamic resistance, clamp-energy.ts's law mirrored for a negative pulse).
 */
export interface InputNodeClamp {
  readonly levelV: number;
  readonly dynamicOhm: number;
}

/** How long the input clamp held the input node at the start of the event. */
export interface InputClampHold {
  readonly levelV: number;
  readonly dynamicOhm: number;
  /** The input node at t = 0+ (the clamp carrying the generator's current less the loop's), V. */
  readonly inputAtStartV: number;
  /** When the clamp let go and the input began to follow the source, s (absent: it held over the whole searched span). */
  readonly releaseS?: number;
}

/**
 * The source (sourceV + extraV·e^(−t/τ) behind sourceOhm, the loop's unclamped source) and the
 * clamp (its level behind its dynamic resistance rd) as one Thevenin source (superposition):
 * (Vth·rd + Vcl·R)/(R + rd) behind R·rd/(R + rd); rd = 0 gives the clamp's level behind nothing.
 */
export function clampThevenin(
  clamp: InputNodeClamp,
  loop: RlcLoop,
  sourceOhm: number,
): { readonly sourceV: number; readonly extraV: number; readonly resistanceOhm: number } {
  const rd = Math.max(clamp.dynamicOhm, 0);
  const k = rd / (sourceOhm + rd);
  return {
    sourceV: loop.sourceV * k + clamp.levelV * (1 - k),
    extraV: (loop.sourceDecay?.extraV ?? 0) * k,
    resistanceOhm: sourceOhm * k,
  };
}

/** Points of the release search's grid over its span, geometric from 1e-9 of it (the loop's extrema come on top). */
const RELEASE_GRID = 400;

/**
 * The input clamp's hold at the start of the event (the loop's first piece, rlc-series.ts
 * HeldStart). The source behind the loop's resistance R (its decaying part Vth(t) = Vs +
 * ΔV·e^(−t/τ) unclamped) would take the input node to Vth(t) − R·i; where that is below the
 * clamp's level Vcl at t = 0+, the clamp conducts and holds the node (Thevenin of the source
 * and the clamp, superposition: Vh(t) = (Vth(t)·rd + Vcl·R)/(R + rd) behind R·rd/(R + rd); rd = 0:
 * the node at Vcl, the source's resistance out of the loop). It lets go where its current
 * (Vcl − v)/rd falls to zero, which is where the generator alone carries the loop current:
 * Vth(t) − R·i(t) = Vcl (KCL at the node; the same condition for any rd). With no loop current
 * this is t = τ·ln((Vth(0) − Vs)/(Vcl − Vs)) (closed form); the back-conducting stage's current
 * flows into the node and lets go earlier, so the condition is solved on the hold's own closed
 * form: the first sign change of Vth(t) − R·i(t) − Vcl over the loop current's extrema (between
 * them i is monotone) and a geometric grid of RELEASE_GRID points, closed by bisection. Returns
 * undefined where the clamp does not conduct at 0+ (the event starts released: the loop as it
 * is) or the source has no resistance (an ideal source no clamp can hold). Once released the
 * clamp is not taken back in while the channel conducts (were the reverse current to fall while
 * the source is still beyond the clamp, the modelled input would go below the clamp's level: more
 * drive for the reverse current, a lower output, the conservative side); after the channel lets go
 * the clamp phase takes it back (turn-off-clamp-phase.ts clampPhaseLoop).
 */
export function heldStart(
  clamp: InputNodeClamp | undefined,
  loop: RlcLoop,
  sourceOhm: number,
  stageOhm: number,
  x0: Vec2,
): { readonly held: HeldStart; readonly hold: InputClampHold } | undefined {
  if (clamp === undefined || !(sourceOhm > 0)) return undefined;
  const vcl = clamp.levelV;
  const g = (t: number, i: number) => sourceAt(loop, t) - sourceOhm * i - vcl;
  if (!(g(0, x0[0]) < 0)) return undefined;
  const th = clampThevenin(clamp, loop, sourceOhm);
  const open: HeldStart = {
    untilS: Number.POSITIVE_INFINITY,
    sourceV: th.sourceV,
    extraV: th.extraV,
    loopResistanceOhm: th.resistanceOhm + stageOhm,
  };
  const s = loopSystem({ ...loop, hold: open });
  const inputAtStartV = open.sourceV + open.extraV - th.resistanceOhm * x0[0];
  const tau = loop.sourceDecay?.tauS ?? 0;
  const decay = slowestDecayPerS(s);
  const span = Math.max(60 * tau, decay > 0 ? 60 / decay : 0, 1e-12);
  const f = (t: number) => g(t, stateAt(s, x0, t)[0]);
  const d = loop.sourceDecay;
  const noCurrent =
    d !== undefined && d.extraV !== 0 && (vcl - loop.sourceV) / d.extraV > 0 && (vcl - loop.sourceV) / d.extraV < 1
      ? [d.tauS * Math.log(d.extraV / (vcl - loop.sourceV))]
      : [];
  const grid = Array.from({ length: RELEASE_GRID }, (_, n) => span * 10 ** (-9 + (9 * (n + 1)) / RELEASE_GRID));
  const nodes = [...extremaTimes(s, x0, [1, 0], span, 4000), ...grid, ...noCurrent.filter((t) => t < span)].sort(
    (a, b) => a - b,
  );
  let a = 0;
  let fa = f(0);
  for (const b of nodes) {
    const fb = f(b);
    if (fb >= 0) {
      const releaseS = fb === 0 ? b : bisect(f, a, b, fa);
      return { held: { ...open, untilS: releaseS }, hold: { ...clamp, inputAtStartV, releaseS } };
    }
    a = b;
    fa = fb;
  }
  return { held: open, hold: { ...clamp, inputAtStartV } };
}
