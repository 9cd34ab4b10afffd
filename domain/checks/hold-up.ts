import { cToK } from "../physics/constants.js";
import type { DiodeParams } from "../physics/diode.js";
import { reverseJunctionA } from "../solve/series-branch.js";
import type { LoadModel } from "../solve/load-model.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import type { StageModel } from "../stages/stage-model.js";
import { type DischargeOutcome, dischargeTime } from "./hold-up-discharge.js";
import type { ControllerTurnOff } from "./reverse-path.js";
import { type TurnOffOutcome, turnOffEvent } from "./turn-off-event.js";

export interface HoldUpModel {
  readonly stage: StageModel;
  readonly outputV: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  readonly load: LoadModel;
  readonly loadMinV: number;
  readonly tjC: number;
  /** The input is disconnected (open), or it falls (a short or a lower voltage) through a loop. */
  readonly input:
    | { readonly kind: "open" }
    | {
        readonly kind: "falls";
        readonly inputAfterV: number;
        /** An input decaying from startV to inputAfterV (TurnOffModel.inputDecay). */
        readonly inputDecay?: { readonly startV: number; readonly tauS: number };
        readonly loopResistanceOhm: number;
        readonly loopInductanceH: number;
        readonly controller?: ControllerTurnOff;
        readonly reverseRecoveryChargeC?: number;
        readonly clampV?: number;
        /** A P-FET's gate lag, s (pfet-gate-off.ts). */
        readonly gateLagS?: number;
      };
}

export type HoldUpOutcome =
  | {
      readonly outcome: "holds";
      /** Total time from the input's loss until the output reaches the load's minimum, s. */
      readonly holdUpS: number;
      /** Time spent in the turn-off event before the stage blocks (0 for an open input), s. */
      readonly eventS: number;
      readonly dischargeS: number;
      readonly method: string;
      readonly reverseLeakageA: number;
      readonly startCapacitorV: number;
    }
  | {
      readonly outcome: "drains-back";
      readonly holdUpS: number;
      readonly reason: string;
      readonly peakReverseCurrentA: number;
      /** The output's lowest voltage over the event, V (below 0 V a negative input pulled it there). */
      readonly outputMinV: number;
      /** When a P-FET's gate turned its channel off, s (absent: it stays on). */
      readonly channelOffS?: number;
    }
  | { readonly outcome: "not-interrupted"; readonly reason: string; readonly settlesAtV?: number }
  | { readonly outcome: "no-hold-up"; readonly reason: string; readonly startOutputV?: number };

/**
 * Hold-up after the input is lost, per stage kind. An open input takes nothing back: the
 * capacitor feeds the load alone (closed forms of hold-up-discharge.ts). A falling input first
 * runs the turn-off event (turn-off-event.ts): a non-blocking stage drains the output into the
 * input, and the hold-up is the time its closed-form response takes to reach the minimum; a
 * blocking stage loses the event's charge, then discharges into the load plus the blocking
 * element's reverse leakage — the diode equation at the junction temperature and the reverse
 * voltage at the start (a Schottky's leakage is far larger and grows steeply with temperature).
 */
export function holdUp(m: HoldUpModel): HoldUpOutcome {
  const tK = cToK(m.tjC);
  if (m.input.kind === "open") {
    return fromDischarge(dischargeTime({ ...m, capacitorV: m.outputV, leakageA: 0 }), 0, 0, m.outputV);
  }
  const inp = m.input;
  const ev: TurnOffOutcome = turnOffEvent({
    stage: m.stage,
    outputV: m.outputV,
    inputAfterV: inp.inputAfterV,
    ...(inp.inputDecay === undefined ? {} : { inputDecay: inp.inputDecay }),
    loopResistanceOhm: inp.loopResistanceOhm,
    loopInductanceH: inp.loopInductanceH,
    capacitanceF: m.capacitanceF,
    esrOhm: m.esrOhm,
    load: m.load,
    loadMinV: m.loadMinV,
    tjC: m.tjC,
    ...(inp.controller === undefined ? {} : { controller: inp.controller }),
    ...(inp.reverseRecoveryChargeC === undefined ? {} : { reverseRecoveryChargeC: inp.reverseRecoveryChargeC }),
    ...(inp.clampV === undefined ? {} : { clampV: inp.clampV }),
    ...(inp.gateLagS === undefined ? {} : { gateLagS: inp.gateLagS }),
  });
  switch (ev.outcome) {
    case "invalid-load-line":
    case "unstable-loop":
    case "clamp-below-drive":
      return { outcome: "no-hold-up", reason: ev.reason };
    case "stays-on":
      return {
        outcome: "not-interrupted",
        reason: `the stage keeps conducting forward: ${ev.reason}`,
        settlesAtV: ev.end.outputV,
      };
    case "does-not-block":
      if (ev.fallsBelowMinS === undefined) {
        return {
          outcome: "not-interrupted",
          reason: `${ev.reason}; the remaining input holds the output at ${ev.settlesAtV.toPrecision(4)} V, above the minimum`,
          settlesAtV: ev.settlesAtV,
        };
      }
      return {
        outcome: "drains-back",
        holdUpS: ev.fallsBelowMinS,
        reason: ev.reason,
        peakReverseCurrentA: ev.gateTurnOff?.peakReverseCurrentA ?? ev.peakReverseCurrentA,
        outputMinV: ev.outputMinV,
        ...(ev.gateTurnOff === undefined ? {} : { channelOffS: ev.gateTurnOff.channelOffS }),
      };
    case "blocks": {
      const after = ev.clamp?.after ?? ev.end;
      // After the event the input goes on towards inputAfterV; a decaying one may pass through a
      // lower level first (startV): the larger reverse voltage of the two holds the leakage.
      const lowestInputV = Math.min(inp.inputAfterV, inp.inputDecay?.startV ?? inp.inputAfterV);
      const reverseV = Math.max(after.capacitorV - lowestInputV, 0);
      const diode = blockingJunction(m.stage);
      const point = behaviourOf(m.stage).reverseLeakage(m.stage);
      const leakageA = diode === undefined ? 0 : Math.max(0, -reverseJunctionA(diode, -reverseV, tK, point));
      return fromDischarge(
        dischargeTime({ ...m, capacitorV: after.capacitorV, leakageA }),
        after.timeS,
        leakageA,
        after.capacitorV,
      );
    }
  }
}

/** The junction that blocks once the stage is off: the diode itself or the MOSFET's body diode. */
export function blockingJunction(stage: StageModel): DiodeParams | undefined {
  return behaviourOf(stage).blockingJunction(stage);
}

function fromDischarge(
  d: DischargeOutcome,
  eventS: number,
  reverseLeakageA: number,
  startCapacitorV: number,
): HoldUpOutcome {
  if (d.outcome === "no-drain") return { outcome: "not-interrupted", reason: d.reason };
  if (d.outcome !== "holds")
    return {
      outcome: "no-hold-up",
      reason: d.reason,
      ...(d.outcome === "below-minimum-at-start" ? { startOutputV: d.startOutputV } : {}),
    };
  return {
    outcome: "holds",
    holdUpS: eventS + d.timeS,
    eventS,
    dischargeS: d.timeS,
    method: d.method,
    reverseLeakageA,
    startCapacitorV,
  };
}
