import { type DiodeAtT, type DiodeParams, diodeAt, forwardCurrentAtA, forwardVoltageAtV } from "../physics/diode.js";

/** How the stage conducts at an operating point. */
export type ConductionMode =
  | "off"
  | "junction"
  | "body-diode"
  | "regulated-drop"
  | "fully-enhanced"
  | "partially-enhanced"
  /** An integrated switch holding its current at its limit: the drop is what the load leaves. */
  | "current-limit"
  /** An integrated switch opened by its overvoltage cut-off: no current, the load unpowered. */
  | "cut-off";

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
export function junctionState(
  d: DiodeParams,
  currentA: number,
  tK: number,
  mode: "junction" | "body-diode",
): ForwardState {
  return junctionStateAt(diodeAt(d, tK), currentA, mode);
}

/** junctionState with the junction's constants already formed at its temperature. */
export function junctionStateAt(d: DiodeAtT, currentA: number, mode: "junction" | "body-diode"): ForwardState {
  const dropV = forwardVoltageAtV(d, currentA);
  return {
    mode,
    dropV,
    lossW: dropV * currentA,
    channelCurrentA: 0,
    bodyDiodeCurrentA: currentA,
    bodyDiodeTimeFraction: mode === "body-diode" ? 1 : 0,
  };
}

/**
 * Voltage across a channel resistance in parallel with its body diode carrying currentA:
 * solves V/R + Id(V) = I (monotone in V) by Newton steps kept inside a shrinking bracket.
 */
export function channelWithBodyDiodeV(rOhm: number, d: DiodeParams, currentA: number, tK: number): number {
  return channelWithBodyDiodeAtV(rOhm, diodeAt(d, tK), currentA);
}

/** channelWithBodyDiodeV with the body diode's constants already formed at its temperature. */
export function channelWithBodyDiodeAtV(rOhm: number, d: DiodeAtT, currentA: number): number {
  const is = d.saturationCurrentA;
  const nvt = d.emissionVoltageV;
  const rs = d.seriesResistanceOhm;
  const id = (v: number): number => forwardCurrentAtA(d, v);
  // The usual case: at I·R the body diode carries a negligible share, and V = (I − Id)·R to
  // first order (the neglected term is Id·R·(dId/dV)·R, far below double precision here).
  const v0 = currentA * rOhm;
  const id0 = id(v0);
  if (id0 <= 1e-9 * currentA) return v0 - id0 * rOhm;
  let lo = 0;
  let hi = Math.min(v0, nvt * Math.log1p(currentA / is) + currentA * rs);
  let v = hi;
  for (let i = 0; i < 100; i += 1) {
    const idv = id(v);
    const f = v / rOhm + idv - currentA;
    if (Math.abs(f) <= 1e-13 * Math.max(currentA, 1e-12)) break;
    if (f > 0) hi = v;
    else lo = v;
    // dId/dV = 1 / (n·Vt/(Id + Is) + Rs)
    const g = 1 / rOhm + 1 / (nvt / (Math.max(idv, 0) + is) + rs);
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
