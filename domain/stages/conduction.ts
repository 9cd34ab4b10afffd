import { type DiodeParams, diodeCurrentA, diodeSlopeOhm, diodeVoltageV } from "../physics/diode.js";

/** How the stage conducts at an operating point. */
export type ConductionMode =
  | "off"
  | "junction"
  | "body-diode"
  | "regulated-drop"
  | "fully-enhanced"
  | "partially-enhanced";

/** The forward state of a stage at a current, temperature and input voltage. */
export interface ForwardState {
  readonly mode: ConductionMode;
  readonly dropV: number;
  /** Loss in the die that carries the load current, W. */
  readonly lossW: number;
  readonly channelCurrentA: number;
  readonly bodyDiodeCurrentA: number;
  readonly gateSourceV?: number;
  readonly channelResistanceOhm?: number;
  /** Share of time the body diode carries the load because the gate is released (0..1). */
  readonly bodyDiodeTimeFraction: number;
}

/** The body diode or a discrete diode carrying all of the current. */
export function junctionState(d: DiodeParams, currentA: number, tK: number, mode: "junction" | "body-diode"): ForwardState {
  const dropV = diodeVoltageV(d, currentA, tK);
  return { mode, dropV, lossW: dropV * currentA, channelCurrentA: 0, bodyDiodeCurrentA: currentA, bodyDiodeTimeFraction: mode === "body-diode" ? 1 : 0 };
}

/**
 * Voltage across a channel resistance in parallel with its body diode carrying currentA:
 * solves V/R + Id(V) = I (monotone in V) by Newton steps kept inside a shrinking bracket.
 */
export function channelWithBodyDiodeV(rOhm: number, d: DiodeParams, currentA: number, tK: number): number {
  let lo = 0;
  let hi = Math.min(currentA * rOhm, diodeVoltageV(d, currentA, tK));
  let v = hi;
  for (let i = 0; i < 100; i += 1) {
    const id = diodeCurrentA(d, v, tK);
    const f = v / rOhm + id - currentA;
    if (Math.abs(f) <= 1e-13 * Math.max(currentA, 1e-12)) break;
    if (f > 0) hi = v;
    else lo = v;
    // dId/dV = 1 / slope at the diode current
    const g = 1 / rOhm + 1 / diodeSlopeOhm(d, Math.max(id, 0), tK);
    let next = v - f / g;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - v) <= 1e-15 * Math.max(v, 1e-12)) {
      v = next;
      break;
    }
    v = next;
  }
  return v;
}
