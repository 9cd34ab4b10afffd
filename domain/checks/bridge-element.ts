import { type DiodeParams, saturationCurrentAt, emissionVoltageV } from "../physics/diode.js";
import { channelResistanceOhm, interpolate } from "../physics/mosfet-channel.js";
import { totalRthKPerW } from "../physics/thermal-path.js";
import type { ForwardLaw } from "../solve/ac-bridge-circuit.js";
import { behaviourOf } from "../stages/stage-behaviours.js";
import { type DiodeStage, type IdealDiodeStage, stageStartV, stageTjMaxC } from "../stages/stage-model.js";

/**
 * One element of a full bridge: a discrete diode (PN or Schottky), or an N-channel MOSFET driven
 * as an ideal diode by a controller (channel when the controller runs, body diode below its start
 * voltage). The shapes are the series stages' own, so a bridge is four stages.
 */
export type BridgeElement = DiodeStage | IdealDiodeStage;

/**
 * Positions in the bridge. line1High conducts from line 1 to OUT+, line2High from line 2 to OUT+,
 * line1Low from OUT− to line 1, line2Low from OUT− to line 2.
 */
export const BRIDGE_POSITIONS = ["line1High", "line2High", "line1Low", "line2Low"] as const;
export type BridgePosition = (typeof BRIDGE_POSITIONS)[number];
export type BridgeElements = Readonly<Record<BridgePosition, BridgeElement>>;

export type Polarity = "positive" | "negative";

/**
 * The pair in the path for each polarity of line 1 against line 2 (Kirchhoff: a current into
 * line 1 must leave through OUT+ and return from OUT− to line 2). The other two elements block
 * with the load voltage plus the drop of the conducting element on the same line across them.
 */
export const CONDUCTING_PAIR: Readonly<Record<Polarity, readonly [BridgePosition, BridgePosition]>> = {
  positive: ["line1High", "line2Low"],
  negative: ["line2High", "line1Low"],
};

/** For each blocking element, the conducting element whose drop adds to its reverse voltage. */
export const REVERSE_PARTNER: Readonly<Record<BridgePosition, BridgePosition>> = {
  line1Low: "line1High",
  line2High: "line2Low",
  line2Low: "line2High",
  line1High: "line1Low",
};

export function polarityOf(position: BridgePosition): Polarity {
  return position === "line1High" || position === "line2Low" ? "positive" : "negative";
}

export function elementTjMaxC(e: BridgeElement): number {
  return stageTjMaxC(e);
}

export function elementReverseRatingV(e: BridgeElement): number {
  // Every bridge element kind states its reverse (or drain-source) rating.
  return behaviourOf(e).reverseRatingV(e) ?? 0;
}

/** A bridge element with a controller (the ideal-diode MOSFET): the one with a start voltage. */
export function isControlledElement(e: BridgeElement): e is IdealDiodeStage {
  return stageStartV(e) !== undefined;
}

export function elementRthKPerW(e: BridgeElement): number {
  return totalRthKPerW(e.thermal);
}

/** An element's forward law at a temperature, with the mode it conducts in. */
export interface ElementLaw {
  readonly mode: "junction" | "body-diode" | "channel";
  /** Channel resistance when the channel conducts, ohm. */
  readonly channelResistanceOhm?: number;
  /** Drop V and dV/dI ohm at forward current I ≥ 0; at I = 0 the right-hand limit of the drop. */
  readonly law: ForwardLaw;
}

/**
 * The forward law of an element at junction temperature tK, with controllerSupplyV the voltage the
 * element's controller runs from. A diode is Shockley with series resistance (diode.ts). A MOSFET
 * below its controller's start voltage (or with a gate drive below threshold) is its body diode;
 * above, the channel Rds(on)(Vgs, Tj) in parallel with the body diode, Vgs from the controller's
 * gate-drive curve at its supply; with a regulated drop the controller holds the drop at
 * regulatedDropV while the channel alone would drop less (as in the series ideal-diode stage).
 * Reverse current is blocked (the controller turns the gate off on reverse current; reverse
 * leakage is neglected). The controller is quasi-static: its turn-on and turn-off delays
 * (microseconds) are neglected against a mains period; a duty-cycled charge pump's gate release is
 * not modelled here.
 */
export function elementLaw(e: BridgeElement, tK: number, controllerSupplyV: number): ElementLaw {
  if (!isControlledElement(e)) return { mode: "junction", law: junctionLaw(e.diode, tK) };
  const body = e.mosfet.bodyDiode;
  const c = e.controller;
  const vgs = controllerGateV(e, controllerSupplyV);
  if (vgs === undefined) return { mode: "body-diode", law: junctionLaw(body, tK) };
  const rOhm = channelResistanceOhm(e.mosfet.channel, vgs, tK);
  if (rOhm === undefined) return { mode: "body-diode", law: junctionLaw(body, tK) };
  return { mode: "channel", channelResistanceOhm: rOhm, law: channelLaw(rOhm, body, tK, c.regulatedDropV) };
}

/** Gate drive the element's controller delivers at its supply, V; undefined below its start voltage. */
export function controllerGateV(e: IdealDiodeStage, controllerSupplyV: number): number | undefined {
  return gateDriveOf(e)(controllerSupplyV);
}

/** controllerGateV as a function of the supply, with the gate-drive table built once. */
export function gateDriveOf(e: IdealDiodeStage): (controllerSupplyV: number) => number | undefined {
  const c = e.controller;
  const nodes = c.gateDrive.map((p) => [p.inputV, p.gateSourceV] as const);
  return (supplyV) => (supplyV < c.startV ? undefined : interpolate(nodes, supplyV));
}

/** Shockley with series resistance, Is(T) and n·Vt evaluated once for the temperature. */
export function junctionLaw(d: DiodeParams, tK: number): ForwardLaw {
  const is = saturationCurrentAt(d, tK);
  const nvt = emissionVoltageV(d, tK);
  const rs = d.seriesResistanceOhm;
  return {
    dropV: (i) => {
      const x = Math.max(i, 0);
      return nvt * Math.log1p(x / is) + x * rs;
    },
    slopeOhm: (i) => nvt / (Math.max(i, 0) + is) + rs,
  };
}

/**
 * Channel R in parallel with the body diode: V solves V/R + Id(V) = I (monotone), by Newton on
 * ln-form Id = Is·(exp((V − Id·Rs)/nVt) − 1) with the diode current as the inner unknown.
 */
export function channelLaw(rOhm: number, d: DiodeParams, tK: number, regulatedDropV: number): ForwardLaw {
  // Is(T), n·Vt and Rs once per law; the inner loop works on plain numbers. The body current of
  // the last current asked for is kept: the drop and the slope are asked for at the same current.
  const is = saturationCurrentAt(d, tK);
  const nvt = emissionVoltageV(d, tK);
  const rs = d.seriesResistanceOhm;
  let lastI = Number.NaN;
  let lastY = 0;
  const bodyA = (i: number): number => {
    if (i === lastI) return lastY;
    // Unknown: body-diode current y in [0, i]; residual (i − y)·R − Vd(y) = 0, decreasing in y
    // (Vd(0) = 0, so the residual at y = 0 is i·R > 0).
    let lo = 0;
    let hi = i;
    // The body current at the unshared channel voltage bounds y from above; one Newton step
    // from there lands left of the root, and from the left Newton on this convex f is monotone.
    let y = Math.min(i, is * Math.expm1(Math.min((i * rOhm) / nvt, 700)));
    for (let k = 0; k < 60; k += 1) {
      const vd = nvt * Math.log1p(y / is) + y * rs;
      const sd = nvt / (y + is) + rs;
      const f = (i - y) * rOhm - vd;
      if (f > 0) lo = y;
      else hi = y;
      let next = y + f / (rOhm + sd);
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      if (Math.abs(next - y) <= 1e-15 * i + 1e-300) {
        y = next;
        break;
      }
      y = next;
    }
    lastI = i;
    lastY = y;
    return y;
  };
  const regulated = (v: number) => regulatedDropV > 0 && v < regulatedDropV;
  return {
    dropV: (i) => {
      if (!(i > 0)) return Math.max(regulatedDropV, 0);
      const v = (i - bodyA(i)) * rOhm;
      return regulated(v) ? regulatedDropV : v;
    },
    slopeOhm: (i) => {
      if (!(i > 0)) return rOhm;
      const y = bodyA(i);
      if (regulated((i - y) * rOhm)) return 0;
      return 1 / (1 / rOhm + 1 / (nvt / (y + is) + rs));
    },
  };
}
