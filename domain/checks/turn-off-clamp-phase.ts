import {
  extremaTimes,
  firstCrossing,
  loopSystem,
  outputV,
  type RlcLoop,
  releasedLoop,
  shiftLoop,
  sourceAt,
  stateAt,
  type Vec2,
} from "../physics/rlc-series.js";
import { stageTjMaxC } from "../stages/stage-model.js";
import { clampThevenin } from "./turn-off-input-clamp.js";
import { avalancheEnergyAtTjJ } from "./avalanche-derating.js";
import { stageBreakdownV } from "./reverse-path.js";
import type { ClampPhase, TurnOffModel, TurnOffOutcome, WindowState } from "./turn-off-event-types.js";
import { loopCharacter, phaseEnergies } from "./turn-off-loop.js";

export type AfterTurnOff =
  | { readonly kind: "none" }
  | { readonly kind: "below-drive"; readonly outcome: Extract<TurnOffOutcome, { outcome: "clamp-below-drive" }> }
  | { readonly kind: "clamp"; readonly clamp: ClampPhase; readonly outputMinV: number };

/**
 * After the stage turns off at turnOffS with state xOff: the blocking element holds Vcl until the
 * loop current returns to zero (the same closed form with Vs + Vcl as source), if reverse current
 * is flowing; its energy, the rating at the event's Tj and the output's lowest point in it.
 */
export function clampPhase(m: TurnOffModel, loop: RlcLoop, xOff: Vec2, turnOffS: number, i0: number): AfterTurnOff {
  // No clamp phase without reverse current at turn-off. A current at rounding level (a diode
  // recovering at its zero crossing: ~1e-16 A, the crossing located to 1e-15 of its time) counts
  // as none: against the loop's current scale, max(|i0|, ΔV·√(C/L)), below 1e-9.
  const currentScaleA = Math.max(
    Math.abs(i0),
    Math.abs(m.outputV - m.inputAfterV) * Math.sqrt(m.capacitanceF / m.loopInductanceH),
  );
  if (!(xOff[0] < -1e-9 * currentScaleA)) return { kind: "none" };
  const clampV = m.clampV ?? stageBreakdownV(m.stage);
  // From the turn-off on: a decaying input's part decayed to turnOffS; an input clamp holding the input where the source is beyond it.
  const clampLoop: RlcLoop = clampPhaseLoop(m, loop, clampV, turnOffS);
  const driveV =
    m.inputClamp === undefined
      ? outputV(loop, xOff) - sourceAt(loop, turnOffS)
      : outputV(loop, xOff) - (sourceAt(clampLoop, 0) - clampV);
  if (!(clampV > driveV)) {
    return {
      kind: "below-drive",
      outcome: {
        outcome: "clamp-below-drive",
        reason: `the clamp voltage ${clampV} V does not exceed the output-to-input voltage ${driveV.toPrecision(4)} V: the reverse current cannot be turned off`,
        clampV,
        driveV,
        currentAtTurnOffA: -xOff[0],
      },
    };
  }
  const sc = loopSystem(clampLoop);
  const cch = loopCharacter(sc);
  const ramp = (m.loopInductanceH * -xOff[0]) / (clampV - driveV);
  const end =
    firstCrossing(sc, xOff, [1, 0], 0, Math.max(50 * ramp, cch.decayPerS > 0 ? 60 / cch.decayPerS : 50 * ramp)) ?? 0;
  const eventStoredJ = 0.5 * m.capacitanceF * m.outputV * m.outputV + 0.5 * m.loopInductanceH * i0 * i0;
  const energies = phaseEnergies(clampLoop, xOff, end, clampV, eventStoredJ);
  const inductiveEnergyJ = 0.5 * m.loopInductanceH * xOff[0] * xOff[0];
  const absorbedJ = energies.clampJ;
  const clamp: ClampPhase = {
    clampV,
    currentAtTurnOffA: -xOff[0],
    inductiveEnergyJ,
    clampedFormulaJ: (inductiveEnergyJ * clampV) / (clampV - driveV),
    absorbedJ,
    durationS: end,
    ...(m.avalancheRatingJ === undefined
      ? {}
      : avalancheFields(
          m.avalancheRatingJ,
          avalancheEnergyAtTjJ(m.avalancheRatingJ, stageTjMaxC(m.stage), m.tjC),
          absorbedJ,
        )),
    after: windowState(clampLoop, xOff, end, m.outputV, turnOffS),
    energies,
  };
  return { kind: "clamp", clamp, outputMinV: outputMinOver(clampLoop, xOff, end) };
}

/**
 * The clamp phase's loop from the turn-off at turnOffS on: the blocking element's clamp voltage in
 * its source, the stage out of its resistance, the source's decaying part decayed to turnOffS.
 * With an input clamp (TurnOffModel.inputClamp) whose source is still beyond the clamp's level at
 * the turn-off, the clamp holds the input for the whole phase (clampThevenin): as the loop current
 * falls to zero the generator's current returns to the clamp, so it holds wherever it held or
 * let go before; the phase lasts L·I/(Vcl − drive), microseconds against the pulse's decay of
 * milliseconds, and taking the node at the clamp's level where the released node lay above it
 * makes the drive larger, the current fall slower (the conservative side).
 */
export function clampPhaseLoop(m: TurnOffModel, loop: RlcLoop, clampV: number, turnOffS: number): RlcLoop {
  const free = releasedLoop(loop);
  const plain = shiftLoop(
    { ...free, sourceV: m.inputAfterV + clampV, loopResistanceOhm: m.loopResistanceOhm },
    turnOffS,
  );
  const c = m.inputClamp;
  if (c === undefined || !(sourceAt(free, turnOffS) < c.levelV) || !(m.loopResistanceOhm > 0)) return plain;
  const th = clampThevenin(c, shiftLoop(free, turnOffS), m.loopResistanceOhm);
  return {
    ...plain,
    sourceV: th.sourceV + clampV,
    loopResistanceOhm: th.resistanceOhm,
    ...(plain.sourceDecay === undefined ? {} : { sourceDecay: { ...plain.sourceDecay, extraV: th.extraV } }),
  };
}

/** The output's lowest value over [0, tEnd] of a loop from x0: the ends and the output's extrema between. */
export function outputMinOver(p: RlcLoop, x0: Vec2, tEnd: number): number {
  const s = loopSystem(p);
  const k = 1 / (1 + p.esrOhm * p.loadConductanceS);
  let low = outputV(p, x0);
  // A decaying source can push later swings lower than the first few: all extrema then.
  for (const t of [...extremaTimes(s, x0, [k * p.esrOhm, k], tEnd, s.forcing === undefined ? 8 : 4000), tEnd])
    low = Math.min(low, outputV(p, stateAt(s, x0, t)));
  return low;
}

function avalancheFields(ratingJ: number, atTjJ: number, absorbedJ: number) {
  return { avalancheRatingJ: ratingJ, avalancheRatingAtTjJ: atTjJ, withinAvalancheRating: absorbedJ <= atTjJ };
}

export function windowState(p: RlcLoop, x0: Vec2, t: number, v0: number, offsetS = 0): WindowState {
  const x = stateAt(loopSystem(p), x0, t);
  return {
    timeS: offsetS + t,
    currentA: x[0],
    outputV: outputV(p, x),
    capacitorV: x[1],
    chargeLostC: p.capacitanceF * (v0 - x[1]),
    voltageLostV: v0 - x[1],
  };
}
