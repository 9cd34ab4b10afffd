import type { z } from "zod";
import type { Requirement } from "../../contracts/requirement.js";
import { inputFallIssues, type inputDecayField } from "../../contracts/turn-off.js";
import type { ReviewTurnOff } from "../../domain/review/review-turn-off.js";
import { inputProblem } from "../input-problem.js";
import { missingQrrSentence, ONE_OFF_EVENT } from "./reverse-inputs.js";

/** What a turn-off event's input does: the output before it, the level after it and an optional decay to that level. */
export interface FallingInput {
  readonly outputV: number;
  readonly inputAfterV: number;
  readonly inputDecay?: { readonly startV: number; readonly tauS: number };
  readonly inputClamp?: { readonly levelV: number; readonly dynamicOhm: number };
}

/**
 * The one mapping of a turn-off event's input (the review's requirement.turnOff and sizing's
 * turnOff): the output before the event (default the nominal supply) and the input after it
 * (default 0 V, a short; a negative level allowed), with the decay from inputDecay.startV where
 * given (held at inputDecay.clamp's level while the source is beyond it). Defaults said in `assumptions` (as `turnOff.<field>`); an input not below the output is
 * refused, naming the field under `path`.
 */
export function fallingInputOf(
  t: {
    readonly outputV?: number | undefined;
    readonly inputAfterV?: number | undefined;
    readonly inputDecay?: z.output<typeof inputDecayField> | undefined;
  },
  nominalV: number,
  path: readonly string[],
  assumptions: string[],
): FallingInput {
  if (t.inputAfterV === undefined) assumptions.push("turnOff.inputAfterV: 0 V (the input shorted)");
  if (t.outputV === undefined) assumptions.push(`turnOff.outputV: the nominal supply ${nominalV} V before the event`);
  const outputV = t.outputV ?? nominalV;
  const inputAfterV = t.inputAfterV ?? 0;
  const decay = t.inputDecay;
  const [issue] = inputFallIssues(
    { outputV, inputAfterV, inputDecay: decay },
    t.outputV === undefined ? "the nominal supply" : `${path.join(".")}.outputV`,
  );
  if (issue !== undefined) throw inputProblem("invalid-input", [...path, ...issue.path], issue.message);
  return { outputV, inputAfterV, ...decayingInput(decay) };
}

/** The review's turn-off event: defaults recorded (a short from the nominal supply; Tj per candidate). */
export function reviewTurnOffOf(
  t: NonNullable<Requirement["turnOff"]>,
  nominalV: number,
  assumptions: string[],
): ReviewTurnOff {
  const input = fallingInputOf(t, nominalV, ["requirement", "turnOff"], assumptions);
  if (t.tjC === undefined)
    assumptions.push(
      "turnOff.tjC: each candidate's worst-case junction temperature over the corners (the highest ambient where no corner solved)",
    );
  if (t.reverseRecoveryChargeC === undefined)
    assumptions.push(missingQrrSentence("turnOff.reverseRecoveryChargeC", "diode"));
  if (t.clampV === undefined)
    assumptions.push(
      "turnOff.clampV: the blocking element's rated voltage (a lower bound of its breakdown: the energy estimate is conservative)",
    );
  if (t.repetitive === undefined) assumptions.push(ONE_OFF_EVENT("turnOff.repetitive"));
  if (t.gateLag === undefined)
    assumptions.push(
      "turnOff.gateLag: not given, so a P-FET or low-side N-FET candidate's gate follows the output at once (no gate resistor lag): the least reverse voltage at the load, in the turn-off event and in each negative pulse",
    );
  assumptions.push(
    "negative pulses at a P-FET or low-side N-FET candidate (its gate-source sees the output): each is the turn-off event's input, decaying with the pulse's time constant from its start to a constant; where the design's input clamp is below the source, the clamp holds the input at its level (breakdown and dynamic resistance) until the generator alone carries the loop current, then the input follows the source's decay, the loop's state carried across; applied with the supply disconnected (ISO 7637-2 pulse 1) the generator alone, the loop's resistance the generator's Ri (the wiring not added: the larger reverse current); riding on the supply (ISO 7637-2 pulse 3a, a negative surge) the generator and the battery at the nominal supply behind requirement.sourceResistanceOhm as one Thevenin source, Vth = Vb + A·Rb/(Ri + Rb)·e^(−t/τ) behind Ri‖Rb (Rb = 0 holds the input at the supply); the output, capacitance, ESR, inductance and gate lag the turnOff event's",
  );
  return {
    ...input,
    loopResistanceOhm: t.loop.resistanceOhm,
    loopInductanceH: t.loop.inductanceH,
    capacitanceF: t.capacitor.capacitanceF,
    esrOhm: t.capacitor.esrOhm,
    ...(t.tjC === undefined ? {} : { tjC: t.tjC }),
    ...(t.reverseRecoveryChargeC === undefined ? {} : { reverseRecoveryChargeC: t.reverseRecoveryChargeC }),
    ...(t.clampV === undefined ? {} : { clampV: t.clampV }),
    repetitive: t.repetitive ?? false,
    ...(t.gateLag === undefined
      ? {}
      : { gateLagS: (t.gateLag.resistanceOhm * t.gateLag.gateChargeC) / t.gateLag.atGateSourceV }),
    ...(t.loadReverseLimitV === undefined ? {} : { loadReverseLimitV: t.loadReverseLimitV }),
    ...(t.repetition === undefined ? {} : { repetition: t.repetition }),
  };
}

/** The contract's inputDecay (with its clamp at the input node) as the turn-off event's input: one mapping for turnOff and the review. */
export function decayingInput(decay: z.output<typeof inputDecayField> | undefined): {
  inputDecay?: { startV: number; tauS: number };
  inputClamp?: { levelV: number; dynamicOhm: number };
} {
  if (decay === undefined) return {};
  const c = decay.clamp;
  return {
    inputDecay: { startV: decay.startV, tauS: decay.timeConstantS },
    ...(c === undefined ? {} : { inputClamp: { levelV: c.levelV, dynamicOhm: c.dynamicResistanceOhm ?? 0 } }),
  };
}
