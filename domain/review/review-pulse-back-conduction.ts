import type { TransientResult } from "../checks/transient-stress.js";
import type { TurnOffOutcome } from "../checks/turn-off-event.js";
import type { StageModel } from "../stages/stage-model.js";
import { type ReviewTurnOff, type ReviewTurnOffResult, reviewTurnOff } from "./review-turn-off.js";
import type { TransientPulse } from "./transient-library.js";

/** A negative pulse through a P-FET candidate's back-conducting channel (the turn-off event model). */
export type PulseBackConduction =
  | {
      readonly pulseId: string;
      readonly outcome: "assessed";
      /** The input at t = 0+ (the pulse's peak after the design's clamp), V. */
      readonly inputPeakV: number;
      /** The level the pulse decays back to (its base), V. */
      readonly inputAfterV: number;
      readonly tauS: number;
      /** The generator's internal resistance, the loop's resistance (wiring not added), ohm. */
      readonly loopResistanceOhm: number;
      /** The turn-off event's outcome for this input (does-not-block with the gate's turn-off for a P-FET). */
      readonly eventOutcome: TurnOffOutcome["outcome"];
      /** The channel's turn-off by its gate, s (absent: it did not turn off over the span). */
      readonly channelOffS?: number;
      readonly peakReverseCurrentA: number;
      /** Charge the output capacitor lost until the loop current stopped, C. */
      readonly chargeLostC: number;
      /** The output's lowest voltage, V: below 0 the load sees reverse voltage. */
      readonly outputMinV: number;
    }
  /** The event model gave no response for this input (clamp below the drive, an unstable loop): a gap. */
  | { readonly pulseId: string; readonly outcome: "no-response"; readonly reason: string }
  | { readonly pulseId: string; readonly outcome: "not-assessed"; readonly reason: string };

/** Why a pulse riding on the supply is not put through the single loop. */
export const SUPPLY_RIDING_REASON =
  "the pulse rides on the supply: the battery keeps feeding the load through its own low resistance while the pulse comes through the generator's Ri, which one source behind one resistance (the turn-off event's loop) cannot show — through Ri alone the load would drain the output long after the pulse; not assessed";

/**
 * Each negative pulse of the review applied with the supply disconnected (ISO 7637-2 pulse 1: the
 * generator is the loop's only source) that reaches a P-FET candidate, through the requirement's
 * turn-off event (reviewTurnOff, the turnOff procedure's own model) with the pulse as the input
 * after the event: it starts at the pulse's peak after the clamp and decays back to its base with
 * the pulse's time constant (inputDecay); the loop's resistance is the generator's Ri; the output,
 * capacitance, ESR, inductance, gate lag and Tj are the requirement's turn-off event. A P-FET with
 * its gate at ground and the output charged conducts backwards until its lagged |Vgs| falls below
 * threshold: the reverse current peak, the charge lost and the output's minimum are reported.
 * Other stages: none (a low-side N-FET's gate follows the input, which the pulse takes below
 * threshold at once: it is the turn-off event's gate-falls case, not a held-up gate).
 */
export function pulseBackConduction(
  t: ReviewTurnOff,
  req: Parameters<typeof reviewTurnOff>[1],
  stage: StageModel,
  tjC: number,
  pulses: readonly TransientPulse[],
  results: readonly TransientResult[],
): readonly PulseBackConduction[] {
  if (stage.kind !== "pfet-high-side") return [];
  const out: PulseBackConduction[] = [];
  const seen = new Set<string>();
  for (const r of results) {
    if (r.polarity !== "negative" || seen.has(r.pulseId)) continue;
    seen.add(r.pulseId);
    const pulse = pulses.find((p) => p.id === r.pulseId);
    if (pulse === undefined) continue;
    if (pulse.baseV === "supply") {
      out.push({ pulseId: r.pulseId, outcome: "not-assessed", reason: SUPPLY_RIDING_REASON });
      continue;
    }
    const baseV = pulse.baseV;
    const event: ReviewTurnOff = {
      ...t,
      inputAfterV: baseV,
      inputDecay: { startV: r.inputPeakV, tauS: r.tauS },
      loopResistanceOhm: pulse.sourceResistanceOhm,
      tjC,
      repetitive: false,
    };
    const { repetition: _omit, ...once } = event;
    out.push(figures(r, baseV, pulse.sourceResistanceOhm, reviewTurnOff(once, req, { stage }, undefined)));
  }
  return out;
}

function figures(r: TransientResult, baseV: number, ohm: number, e: ReviewTurnOffResult): PulseBackConduction {
  const x = e.result;
  if (x.outcome === "clamp-below-drive" || x.outcome === "invalid-load-line" || x.outcome === "unstable-loop")
    return { pulseId: r.pulseId, outcome: "no-response", reason: `${x.outcome}: ${x.reason}` };
  const gate = x.outcome === "does-not-block" ? x.gateTurnOff : undefined;
  return {
    pulseId: r.pulseId,
    outcome: "assessed",
    inputPeakV: r.inputPeakV,
    inputAfterV: baseV,
    tauS: r.tauS,
    loopResistanceOhm: ohm,
    eventOutcome: x.outcome,
    ...(gate === undefined ? {} : { channelOffS: gate.channelOffS }),
    peakReverseCurrentA: gate?.peakReverseCurrentA ?? x.peakReverseCurrentA,
    chargeLostC: gate?.chargeLostC ?? x.end.chargeLostC,
    outputMinV: x.outputMinV,
  };
}
