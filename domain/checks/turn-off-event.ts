import { cToK } from "../physics/constants.js";
import {
  firstCrossing,
  extremaTimes,
  loopSystem,
  outputV,
  type RlcLoop,
  shiftSystem,
  sourceAt,
  stateAt,
  stateIntegral,
  type Vec2,
} from "../physics/rlc-series.js";
import { reversePath } from "./reverse-path.js";
import { gateOffTime } from "./pfet-gate-off.js";
import { clampPhase, outputMinOver, windowState } from "./turn-off-clamp-phase.js";
import { heldStart } from "./turn-off-input-clamp.js";
import { loadLine, loopCharacter, phaseEnergies, unstableLoop } from "./turn-off-loop.js";

import type { GateTurnOff, TurnOffCommon, TurnOffModel, TurnOffOutcome } from "./turn-off-event-types.js";

export type {
  ClampPhase,
  GateTurnOff,
  TurnOffCommon,
  TurnOffModel,
  TurnOffOutcome,
  WindowState,
} from "./turn-off-event-types.js";

/**
 * Reverse-current event at an input that falls at t = 0, on the closed-form R-L-C response
 * (domain/physics/rlc-series.ts): the stage's channel (or a diode's series resistance) in the
 * loop until it turns off, then — for a blocking stage with reverse current — a clamp phase in
 * which the blocking element holds Vcl until the loop current returns to zero (the same closed
 * form with Vs + Vcl as source). A diode's junction drop is not in the loop (it shifts the
 * pre-event input only); the channel resistance is held at its pre-event value. An input that
 * decays after the event (m.inputDecay: from startV to inputAfterV as e^(−t/τ)) is the loop's
 * exponential forcing in the same closed form; each later phase takes it decayed to its start.
 */
export function turnOffEvent(m: TurnOffModel): TurnOffOutcome {
  const tK = cToK(m.tjC);
  const line = loadLine(m.load, m.outputV);
  // 1 + ESR·G → 0 makes the output's gain on the capacitor current, ESR/(1 + ESR·G), unbounded
  // and the loop's modes 1e8 apart: near it the closed form is rounding (at 2e-6 of it the output
  // came out at −4.9e5 V, at 2e-16 the energy balance at 170). Within 0.1 % of V²/P the tangent
  // says nothing a converter at the edge of collapse would do.
  if (!(1 + m.esrOhm * line.conductanceS > 1e-3)) {
    return {
      outcome: "invalid-load-line",
      reason:
        "the capacitor ESR is within 0.1 % of V²/P of the constant-power load, or above it (ESR·P/V² >= 0.999): the output is at the edge of collapse and the linearised loop has no meaning",
      path: "esrOhm",
    };
  }
  const i0 = line.currentA + line.conductanceS * m.outputV;
  const vinBefore = m.outputV + i0 * m.loopResistanceOhm;
  const path = reversePath(m.stage, tK, vinBefore, m.inputAfterV, m.outputV, m.controller);
  const stageOhm = path.kind === "diode" ? path.seriesOhm : path.channelOhm;
  const free: RlcLoop = {
    sourceV: m.inputAfterV,
    ...inputDecayOf(m),
    loopResistanceOhm: m.loopResistanceOhm + stageOhm,
    inductanceH: m.loopInductanceH,
    capacitanceF: m.capacitanceF,
    esrOhm: m.esrOhm,
    loadCurrentA: line.currentA,
    loadConductanceS: line.conductanceS,
  };
  // An input clamp holding the input at the start: the loop's first piece (turn-off-input-clamp.ts).
  const held = heldStart(m.inputClamp, free, m.loopResistanceOhm, stageOhm, [i0, m.outputV]);
  const loop: RlcLoop = held === undefined ? free : { ...free, hold: held.held };
  const s = loopSystem(loop);
  const unstable = unstableLoop(s, line.conductanceS) ?? (s.next && unstableLoop(s.next.system, line.conductanceS));
  if (unstable !== undefined) return unstable;
  const ch = loopCharacter(s);
  const x0: Vec2 = [i0, m.outputV];
  const span = (c: ReturnType<typeof loopCharacter>) =>
    c.decayPerS > 0 ? 60 / c.decayPerS : (400 * Math.PI) / Math.max(c.naturalRadPerS, 1e-300);
  // A held start: the released loop's own span from its release on, where that is later.
  const horizon = s.next === undefined ? span(ch) : Math.max(span(ch), s.next.atS + span(loopCharacter(s.next.system)));
  // tEnd: the end of the window; conducting: the stage still conducts there (it never blocks),
  // so the reverse current is followed on the same loop until it turns, up to the horizon.
  const common = (tEnd: number, conducting = false): TurnOffCommon => {
    const peak = peakReverse(s, x0, tEnd, conducting ? Math.max(tEnd, horizon) : tEnd, conducting);
    return {
      loop: { ...ch, totalResistanceOhm: loop.loopResistanceOhm, stageResistanceOhm: stageOhm },
      loadMethod: line.method,
      initialCurrentA: i0,
      initialSlopeAPerS:
        loop.hold === undefined
          ? (sourceAt(loop, 0) - vinBefore - i0 * stageOhm) / m.loopInductanceH
          : (sourceAt(loop, 0) - m.outputV - i0 * loop.hold.loopResistanceOhm) / m.loopInductanceH,
      peakReverseCurrentA: peak.currentA,
      peakReverseTimeS: peak.timeS,
      ...(peak.lowerBound ? { peakReverseIsLowerBound: true as const } : {}),
      end: windowState(loop, x0, tEnd, m.outputV),
      energies: phaseEnergies(loop, x0, tEnd, 0),
      outputMinV: outputMinOver(loop, x0, tEnd),
      ...(held === undefined ? {} : { inputClampHold: held.hold }),
    };
  };

  let turnOffS: number;
  let detectS: number | undefined;
  switch (path.kind) {
    case "channel-stays-on": {
      const k = 1 / (1 + m.esrOhm * line.conductanceS);
      const level = m.loadMinV + k * m.esrOhm * line.currentA;
      const fall = firstCrossing(s, x0, [k * m.esrOhm, k], level, horizon);
      const settles = outputV(loop, stateAt(s, x0, horizon));
      const c = common(fall ?? horizon, true);
      const reason = path.reason;
      const gate = path.gateFromOutput ? gateTurnOff(m, loop, s, x0, i0, path, horizon) : undefined;
      const out =
        fall === undefined
          ? { outcome: "does-not-block" as const, reason, settlesAtV: settles, ...c }
          : { outcome: "does-not-block" as const, reason, fallsBelowMinS: fall, settlesAtV: settles, ...c };
      if (gate === undefined) return out;
      if ("outcome" in gate) return gate;
      // The channel's turn-off ends the event: the output's lowest point is the gate's figure.
      return { ...out, outputMinV: gate.outputMinV, gateTurnOff: gate };
    }
    case "controller": {
      const t = firstCrossing(s, x0, [1, 0], -path.tripCurrentA, horizon);
      if (t === undefined) {
        return {
          outcome: "stays-on",
          reason: `the reverse current never reaches the trip level ${path.tripCurrentA.toPrecision(4)} A (threshold / Rds(on)): the controller keeps the channel on`,
          ...common(horizon, true),
        };
      }
      detectS = t;
      turnOffS = t + path.offDelayS;
      break;
    }
    case "diode": {
      const t0 = firstCrossing(s, x0, [1, 0], 0, horizon);
      if (t0 === undefined)
        return {
          outcome: "stays-on",
          reason: "the diode current never reverses: it stays forward biased",
          ...common(horizon, true),
        };
      turnOffS = recoveryEnd(s, x0, t0, m.reverseRecoveryChargeC ?? 0, horizon);
      detectS = t0;
      break;
    }
  }
  const c = common(turnOffS);
  const base = { outcome: "blocks" as const, turnOffS, ...(detectS === undefined ? {} : { detectS }), ...c };
  const after = clampPhase(m, loop, stateAt(s, x0, turnOffS), turnOffS, i0);
  if (after.kind === "below-drive") return after.outcome;
  if (after.kind === "none") return base;
  return { ...base, outputMinV: Math.min(base.outputMinV, after.outputMinV), clamp: after.clamp };
}

/** The loop source's decaying part for an input that decays after the event (none for a step). */
export function inputDecayOf(m: TurnOffModel): Pick<RlcLoop, "sourceDecay"> {
  const d = m.inputDecay;
  return d === undefined ? {} : { sourceDecay: { extraV: d.startV - m.inputAfterV, tauS: d.tauS } };
}

/**
 * A FET whose gate sees the output (a P-FET with its gate at ground, a low-side N-FET with its gate
 * fed from the positive rail; pfet-gate-off.ts): the channel conducts backwards until its
 * lagged |Vgs| falls below threshold, then the body diode blocks and the loop current is clamped
 * back to zero (clampPhase). The reverse-current peak up to the turn-off (the clamp then drives it
 * down), the charge the output capacitor lost by the end and the output's lowest point, which
 * lies below 0 V where a negative input pulled it there before the gate let go.
 */
function gateTurnOff(
  m: TurnOffModel,
  loop: RlcLoop,
  s: ReturnType<typeof loopSystem>,
  x0: Vec2,
  i0: number,
  path: Extract<ReturnType<typeof reversePath>, { kind: "channel-stays-on" }>,
  horizon: number,
): GateTurnOff | Extract<TurnOffOutcome, { outcome: "clamp-below-drive" }> | undefined {
  const lagS = m.gateLagS ?? 0;
  const off = gateOffTime(
    loop,
    s,
    x0,
    { thresholdV: path.thresholdV, clampV: path.gateFromOutput?.clampV, lagS },
    horizon,
  );
  if (off === undefined) return undefined;
  const xOff = stateAt(s, x0, off);
  const peak = peakReverse(s, x0, off, off, false);
  const after = clampPhase(m, loop, xOff, off, i0);
  if (after.kind === "below-drive") return after.outcome;
  const endState = after.kind === "clamp" ? after.clamp.after : windowState(loop, x0, off, m.outputV);
  const outputMinV = Math.min(outputMinOver(loop, x0, off), after.kind === "clamp" ? after.outputMinV : Infinity);
  return {
    channelOffS: off,
    gateLagS: lagS,
    outputAtOffV: outputV(loop, xOff),
    currentAtOffA: xOff[0],
    peakReverseCurrentA: peak.currentA,
    chargeLostC: endState.chargeLostC,
    outputMinV,
    end: endState,
    ...(after.kind === "clamp" ? { clamp: after.clamp } : {}),
  };
}

/**
 * Largest −i(t) on [0, searchS] (searchS ≥ tEnd): the end points and the first two extrema of i.
 * A stage that blocks is searched to its turn-off (the clamp then drives the current back to
 * zero, so that is the event's maximum); one that keeps conducting (`open`) is followed past the
 * window on the same loop until the current turns. Where the largest value is still the end of
 * such a search (the current rising there), it is only a lower bound and says so.
 */
function peakReverse(
  s: ReturnType<typeof loopSystem>,
  x0: Vec2,
  tEnd: number,
  searchS: number,
  open: boolean,
): { currentA: number; timeS: number; lowerBound: boolean } {
  let best = { currentA: 0, timeS: 0 };
  // A constant input: the natural response decays, so its first two extrema hold the largest. A
  // decaying input can push later swings further (a slow fall under a ringing loop): all of them.
  const count = s.forcing === undefined ? 2 : 4000;
  for (const t of [0, ...extremaTimes(s, x0, [1, 0], searchS, count), tEnd, searchS]) {
    const rev = -stateAt(s, x0, t)[0];
    if (rev > best.currentA) best = { currentA: rev, timeS: t };
  }
  return { ...best, lowerBound: open && best.currentA > 0 && best.timeS >= searchS };
}

/**
 * Charge-control view of reverse recovery: after the current crosses zero at t0 the diode
 * conducts in reverse until the charge Qrr has been drawn out (∫ from t0 of −i = Qrr), then it
 * snaps off. If the first reverse lobe ends first, the diode recovers there at zero current.
 */
function recoveryEnd(s: ReturnType<typeof loopSystem>, x0: Vec2, t0: number, qrrC: number, horizon: number): number {
  if (!(qrrC > 0)) return t0;
  const x1 = stateAt(s, x0, t0);
  // From t0 on (a decaying input's forcing decayed to t0: shiftSystem).
  const s1 = shiftSystem(s, t0);
  // The lobe ends where i returns to zero after its (first) extremum.
  const tMin = extremaTimes(s1, x1, [1, 0], horizon, 1)[0];
  const back =
    tMin === undefined ? undefined : firstCrossing(shiftSystem(s1, tMin), stateAt(s1, x1, tMin), [1, 0], 0, horizon);
  const lobeEnd = tMin === undefined || back === undefined ? horizon : tMin + back;
  const drawn = (t: number): number => -stateIntegral(s1, x1, t)[0] - qrrC;
  if (drawn(lobeEnd) < 0) return t0 + lobeEnd;
  let lo = 0;
  let hi = lobeEnd;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i += 1) {
    const mid = 0.5 * (lo + hi);
    if (drawn(mid) < 0) lo = mid;
    else hi = mid;
  }
  return t0 + 0.5 * (lo + hi);
}
