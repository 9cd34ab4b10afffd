import type { ClampLaw } from "../checks/clamp-energy.js";
import type { TransientResult } from "../checks/transient-stress.js";
import type { TurnOffOutcome } from "../checks/turn-off-event.js";
import { twoSourceThevenin } from "../physics/two-source-thevenin.js";
import type { StageModel } from "../stages/stage-model.js";
import { gateFollowsOutput, type ReviewTurnOff, type ReviewTurnOffResult, reviewTurnOff } from "./review-turn-off.js";
import type { TransientPulse } from "./transient-library.js";

/** A negative pulse through a P-FET's or low-side N-FET's back-conducting channel (the turn-off event model). */
export type PulseBackConduction =
  | {
      readonly pulseId: string;
      readonly outcome: "assessed";
      /** The input at t = 0+ (the Thevenin source's start, limited by the design's clamp), V. */
      readonly inputPeakV: number;
      /** The level the input decays back to (the Thevenin source's constant part), V. */
      readonly inputAfterV: number;
      readonly tauS: number;
      /** The loop's resistance: the generator's Ri, in parallel with the battery's where the pulse rides on the supply (wiring not added), ohm. */
      readonly loopResistanceOhm: number;
      /** A pulse riding on the supply: the battery's resistance (the requirement's sourceResistanceOhm), ohm. */
      readonly batteryResistanceOhm?: number;
      /** The turn-off event's outcome for this input (does-not-block with the gate's turn-off for a P-FET). */
      readonly eventOutcome: TurnOffOutcome["outcome"];
      /**
       * turned-off: the lagged |Vgs| fell below threshold and the channel let go (channelOffS);
       * conducts-throughout: the output held |Vgs| above threshold over the span (the battery
       * holds it): the channel conducts backwards into the pulse and its reverse peak is the figure.
       */
      readonly channel: "turned-off" | "conducts-throughout";
      /** The channel's turn-off by its gate, s (absent: it did not turn off over the span). */
      readonly channelOffS?: number;
      /** Once the channel let go and the loop current stopped: the output its body diode holds against the input, V. */
      readonly outputAtLetGoV?: number;
      readonly peakReverseCurrentA: number;
      /** The channel conducting throughout with the current still rising at the span's end: the peak is only a lower bound. */
      readonly peakReverseIsLowerBound?: true;
      /** Charge the output capacitor lost until the loop current stopped, C (conducts-throughout: net, at the span's end). */
      readonly chargeLostC: number;
      /** The output's lowest voltage, V: below 0 the load sees reverse voltage. */
      readonly outputMinV: number;
      /**
       * The design's input clamp held the input at its level at the start (turn-off-input-clamp.ts):
       * its level and dynamic resistance, and when it let go (absent: it held over the whole span).
       */
      readonly clampHold?: { readonly levelV: number; readonly dynamicOhm: number; readonly releaseS?: number };
    }
  /** The event model gave no response for this input (clamp below the drive, an unstable loop): a gap. */
  | {
      readonly pulseId: string;
      readonly outcome: "no-response";
      readonly reason: string;
      /**
       * clamp-below-drive: the output-to-input voltage across the blocking element when the channel
       * let go, V, beyond its breakdown (it avalanches with the reverse current not turned off).
       */
      readonly driveV?: number;
    }
  /** The requirement has no turn-off event (requirement.turnOff): the pulse's back-conduction is a gap, with what to add. */
  | { readonly pulseId: string; readonly outcome: "not-assessed"; readonly reason: string };

/** Why a negative pulse at a P-FET is not assessed without the requirement's turn-off event. */
export const NO_TURN_OFF_REASON =
  "the requirement has no turnOff section: the P-FET's channel conducts backwards into the negative pulse until its gate lets go, and the output capacitor (turnOff.capacitor), the loop (turnOff.loop), the gate lag (turnOff.gateLag) and the load's reverse-voltage limit (turnOff.loadReverseLimitV) decide the reverse current and how far below 0 V the output goes; add requirement.turnOff to assess it";

/** The supply a pulse may ride on: the requirement's nominal battery behind its source resistance. */
export interface PulseSupply {
  readonly nominalV: number;
  /** The requirement's sourceResistanceOhm (source and wiring), ohm. */
  readonly resistanceOhm: number;
}

/**
 * Each negative pulse of the review that reaches a P-FET candidate, through the requirement's
 * turn-off event (reviewTurnOff, the turnOff procedure's own model). The loop's source is what the
 * stage sees of the pulse generator (open circuit g0 + A·e^(−t/τ) behind Ri) and, where the pulse
 * rides on the supply (ISO 7637-2 pulse 3a, a negative surge on the supply), the battery at the
 * nominal supply behind the requirement's source resistance Rb, as one Thevenin source
 * (two-source-thevenin.ts): Vth(t) = Vb + A·Rb/(Ri + Rb)·e^(−t/τ) behind Ri‖Rb (g0 = Vb). A
 * pulse applied with the supply disconnected (ISO 7637-2 pulse 1) is its limit Rb → ∞: the
 * generator alone, Vth = g0 + A·e^(−t/τ) behind Ri. The input starts at Vth(0+) (held by the
 * design's clamp, below, while the source is beyond it) and decays to Vth's constant part with
 * the pulse's τ (inputDecay); the output, capacitance, ESR, inductance, gate lag and Tj
 * are the requirement's turn-off event. With Rb = 0 (the requirement's default) the battery holds
 * the input at Vb and the pulse does not move it. A P-FET with its gate at ground conducts
 * backwards until its lagged |Vgs| falls below threshold; where the output holds it above (the
 * battery holds the output) it conducts backwards into the pulse throughout and the reverse
 * current peak is the figure. A low-side N-FET takes the same path: its gate is fed from the
 * positive rail and its source is the module's ground, so its Vgs is the output's, not the input's
 * (ngspice on that circuit: test/domain/review/pulse-back-conduction-low-side.test.ts). Other
 * stages: none.
 *
 * The design's input clamp (clamp: breakdown and dynamic resistance, symmetric as the transient
 * check takes it) holds the input at −Vbr while the source behind Ri is beyond it and lets go where
 * the generator alone carries the loop current (turn-off-input-clamp.ts): the source is the
 * unclamped Vth(t), the clamp's hold its first piece. Left out, each on the conservative side
 * (test/domain/review/pulse-clamp-hold-omissions.test.ts):
 * - the body diode's forward drop: while reverse current flows through the channel its drop i·Rds
 *   reverse-biases the diode, and in the clamp phase it is in avalanche; it could conduct forward
 *   only with forward current (the input above the output), which returns charge to the output and
 *   raises it, so without it the charge lost is no smaller and the output's lowest point no higher;
 * - the I·R offset before the event: the output starts at the event's outputV (the nominal supply
 *   by default), not Vb − I·(Rb + Rds); a higher start drives more reverse current and keeps the
 *   lagged gate on longer, so all three figures are at least as severe as from the true start.
 * Without requirement.turnOff (t undefined) each negative pulse at a P-FET or low-side N-FET is not-assessed, with
 * what to add.
 */
export function pulseBackConduction(
  t: ReviewTurnOff | undefined,
  req: Parameters<typeof reviewTurnOff>[1],
  stage: StageModel,
  tjC: number,
  supply: PulseSupply,
  pulses: readonly TransientPulse[],
  results: readonly TransientResult[],
  clamp?: ClampLaw,
): readonly PulseBackConduction[] {
  if (!gateFollowsOutput(stage)) return [];
  const out: PulseBackConduction[] = [];
  const seen = new Set<string>();
  for (const r of results) {
    if (r.polarity !== "negative" || seen.has(r.pulseId)) continue;
    seen.add(r.pulseId);
    const pulse = pulses.find((p) => p.id === r.pulseId);
    if (pulse === undefined) continue;
    if (t === undefined) {
      out.push({ pulseId: r.pulseId, outcome: "not-assessed", reason: NO_TURN_OFF_REASON });
      continue;
    }
    const riding = pulse.baseV === "supply";
    const baseV = riding ? supply.nominalV : pulse.baseV;
    const amplitudeV = r.peakOpenCircuitV - baseV;
    const th = riding
      ? twoSourceThevenin({
          batteryV: supply.nominalV,
          batteryOhm: supply.resistanceOhm,
          generatorBaseV: baseV,
          generatorAmplitudeV: amplitudeV,
          generatorOhm: pulse.sourceResistanceOhm,
        })
      : { finalV: baseV, startV: baseV + amplitudeV, resistanceOhm: pulse.sourceResistanceOhm };
    // The source unclamped; the design's clamp (bidirectional, as the transient check takes it)
    // holds the input at −Vbr behind its dynamic resistance while the source is beyond it.
    const startV = th.startV;
    // The requirement's own event's input clamp is not the pulse's: only the design's clamp acts.
    const { inputClamp: _own, ...own } = t;
    const event: ReviewTurnOff = {
      ...own,
      inputAfterV: th.finalV,
      inputDecay: { startV, tauS: r.tauS },
      ...(clamp === undefined ? {} : { inputClamp: { levelV: -clamp.breakdownV, dynamicOhm: clamp.dynamicOhm } }),
      loopResistanceOhm: th.resistanceOhm,
      tjC,
      repetitive: false,
    };
    const { repetition: _omit, ...once } = event;
    const e = reviewTurnOff(
      once,
      { ...req, loadMinV: searchFloorV(t.outputV, startV, th.finalV) },
      { stage },
      undefined,
    );
    if (e.result.outcome === "does-not-block" && e.result.fallsBelowMinS !== undefined) {
      out.push({ pulseId: r.pulseId, outcome: "no-response", reason: BELOW_FLOOR });
      continue;
    }
    out.push(
      figures(r, { startV, finalV: th.finalV, ohm: th.resistanceOhm }, riding ? supply.resistanceOhm : undefined, e),
    );
  }
  return out;
}

const BELOW_FLOOR =
  "the output fell below the searched floor (ten times the event's swing below its lowest input) with the channel still on: its lowest point is not found";

/**
 * The level below which the output's lowest point is searched. The turn-off event ends a falling
 * input's window where the output crosses the load's minimum (the load has dropped out), but a
 * pulse's input comes back: a channel that stays on (its lagged |Vgs| above threshold) can pull
 * the output below 0 V and let it recover, so the window must run the whole span. The floor lies
 * ten times the event's swing below its lowest input, beyond any overshoot of the loop (at most
 * the swing itself for an undamped step); an output below it is reported as no response.
 */
function searchFloorV(outputV: number, startV: number, finalV: number): number {
  const lo = Math.min(outputV, startV, finalV);
  const hi = Math.max(outputV, startV, finalV);
  return lo - 10 * (hi - lo) - 1;
}

function figures(
  r: TransientResult,
  input: { startV: number; finalV: number; ohm: number },
  batteryOhm: number | undefined,
  e: ReviewTurnOffResult,
): PulseBackConduction {
  const x = e.result;
  if (x.outcome === "clamp-below-drive" || x.outcome === "invalid-load-line" || x.outcome === "unstable-loop")
    return {
      pulseId: r.pulseId,
      outcome: "no-response",
      reason: `${x.outcome}: ${x.reason}`,
      ...(x.outcome === "clamp-below-drive" ? { driveV: x.driveV } : {}),
    };
  const gate = x.outcome === "does-not-block" ? x.gateTurnOff : undefined;
  const hold = x.inputClampHold;
  return {
    pulseId: r.pulseId,
    outcome: "assessed",
    inputPeakV: hold?.inputAtStartV ?? input.startV,
    inputAfterV: input.finalV,
    tauS: r.tauS,
    loopResistanceOhm: input.ohm,
    ...(batteryOhm === undefined ? {} : { batteryResistanceOhm: batteryOhm }),
    eventOutcome: x.outcome,
    channel: gate === undefined ? "conducts-throughout" : "turned-off",
    ...(gate === undefined ? {} : { channelOffS: gate.channelOffS, outputAtLetGoV: gate.end.outputV }),
    peakReverseCurrentA: gate?.peakReverseCurrentA ?? x.peakReverseCurrentA,
    ...(gate === undefined && x.peakReverseIsLowerBound === true ? { peakReverseIsLowerBound: true as const } : {}),
    chargeLostC: gate?.chargeLostC ?? x.end.chargeLostC,
    outputMinV: x.outputMinV,
    ...(hold === undefined
      ? {}
      : {
          clampHold: {
            levelV: hold.levelV,
            dynamicOhm: hold.dynamicOhm,
            ...(hold.releaseS === undefined ? {} : { releaseS: hold.releaseS }),
          },
        }),
  };
}
