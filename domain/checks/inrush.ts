import { constantPowerCharge } from "./inrush-constant-power.js";

/**
 * Start-up charge of the output capacitance through the stage (inrush), in closed form.
 *
 * The output node holds C (from 0 V) in parallel with the load; the stage connects it to the
 * input Vin, which is steady during the charge. Three drives:
 *
 * - uncontrolled: the channel is fully on from t = 0, the loop is Rt = Rch + Rloop (source,
 *   wiring, ESR). First-order RC (circuit theory): I(t) = Iss + (I0 − Iss)·e^(−t/τ) with
 *   I0 = Vin/Rt; no load: Iss = 0, τ = Rt·C; constant current IL: Iss = IL, τ = Rt·C; a resistor
 *   RL: Iss = Vin/(Rt + RL), τ = C·Rt·RL/(Rt + RL). The channel dissipates I²·Rch; with no load its
 *   share of the ½·C·Vin² the loop loses is Rch/Rt. The charge is taken as done at 99 % of its
 *   final voltage (τ·ln 100).
 * - slew: the gate sets dV/dt = s (a controller's soft start or a gate RC), V = s·t up to Vin at
 *   T = Vin/s; I = C·s + IL(V), P = (Vin − V)·I. Energy: no load ½·C·Vin² (the classic result: at
 *   constant charging current the pass element loses what the capacitor stores), plus
 *   IL·Vin²/(2s) for a constant current, plus Vin³/(6·RL·s) for a resistor.
 * - current limit: the switch holds I = Ilim; C·dV/dt = Ilim − IL(V). No load or constant
 *   current: T = C·Vin/(Ilim − IL), E = Ilim·Vin·T/2. A resistor: V = Ilim·RL·(1 − e^(−t/(RL·C))),
 *   T = −RL·C·ln(1 − Vin/(Ilim·RL)), E = Ilim·(Vin·T − Ilim·RL·T + RL·C·Vin). Where the load takes
 *   the whole limit before Vin (IL ≥ Ilim, or Ilim·RL ≤ Vin), the output stalls: it never charges.
 *   The charge is taken as done at Vin (the limit's release just below it is neglected: a longer,
 *   hotter charge).
 * A constant-power load (a converter's input, drawing P/V above its start voltage) in the slew and
 * current-limit drives: inrush-constant-power.ts.
 * Checked against these closed forms and ngspice on the same circuits (test/domain/checks/inrush*.test.ts).
 */
export type InrushLoad =
  | { readonly kind: "none" }
  | { readonly kind: "constant-current"; readonly currentA: number }
  | { readonly kind: "resistive"; readonly resistanceOhm: number }
  /** A converter's input: nothing below its start voltage (its undervoltage lockout), P/V above it. */
  | { readonly kind: "constant-power"; readonly powerW: number; readonly startV: number };

export type InrushDrive =
  | { readonly kind: "uncontrolled"; readonly channelOhm: number; readonly loopOhm: number }
  | { readonly kind: "slew"; readonly slewVPerS: number }
  | { readonly kind: "current-limit"; readonly limitA: number };

export interface InrushCircuit {
  readonly inputV: number;
  readonly capacitanceF: number;
  readonly load: InrushLoad;
  readonly drive: InrushDrive;
}

/** The charge's waveform in closed form: the output voltage and the stage's current and loss against time. */
export interface InrushWaveform {
  /** Time at which the charge counts as done, s. */
  readonly chargeTimeS: number;
  /** Span over which the stage's loss is followed (the uncontrolled charge's tail: 10 τ), s. */
  readonly spanS: number;
  readonly outputV: (tS: number) => number;
  readonly currentA: (tS: number) => number;
  readonly powerW: (tS: number) => number;
  /** Energy the stage dissipates over the charge (to chargeTimeS; uncontrolled: over the whole exponential), J. */
  readonly energyJ: number;
  readonly peakCurrentA: number;
  readonly peakPowerW: number;
  /** The stage's voltage at its peak power, V (the peak power's current is peakPowerW over it). */
  readonly peakPowerVdsV: number;
}

export type InrushCharge =
  | ({ readonly outcome: "charges" } & InrushWaveform)
  | {
      readonly outcome: "stalls";
      /** The output voltage where the load takes the whole available current, V. */
      readonly stallV: number;
      /** The stage's loss held at the stall, W. */
      readonly stallPowerW: number;
      readonly reason: string;
    };

type SimpleLoad = Exclude<InrushLoad, { readonly kind: "constant-power" }>;

function loadA(load: SimpleLoad, v: number): number {
  if (load.kind === "none") return 0;
  return load.kind === "constant-current" ? load.currentA : v / load.resistanceOhm;
}

export function inrushCharge(c: InrushCircuit): InrushCharge {
  if (c.load.kind === "constant-power")
    return c.load.startV >= c.inputV
      ? simpleCharge(c, { kind: "none" })
      : constantPowerCharge(c, c.load.powerW, c.load.startV);
  return simpleCharge(c, c.load);
}

function simpleCharge(c: InrushCircuit, load: SimpleLoad): InrushCharge {
  const vin = c.inputV;
  const cap = c.capacitanceF;
  const d = c.drive;
  if (d.kind === "uncontrolled") {
    const rt = d.channelOhm + d.loopOhm;
    const i0 = vin / rt;
    let iss = 0;
    let tau = rt * cap;
    if (load.kind === "constant-current") iss = load.currentA;
    if (load.kind === "resistive") {
      iss = vin / (rt + load.resistanceOhm);
      tau = (cap * rt * load.resistanceOhm) / (rt + load.resistanceOhm);
    }
    if (iss >= i0) {
      return {
        outcome: "stalls",
        stallV: 0,
        stallPowerW: i0 * i0 * d.channelOhm,
        reason: `the load's ${round(iss)} A is at least what the loop passes at 0 V (${round(i0)} A): the output never rises`,
      };
    }
    const currentA = (t: number) => iss + (i0 - iss) * Math.exp(-Math.max(0, t) / tau);
    const a = i0 - iss;
    // ∫(Iss + a·e^(−t/τ))² dt over 0..∞ less the steady Iss² part (the load's own conduction loss, not the inrush).
    const energyJ = d.channelOhm * (2 * iss * a * tau + (a * a * tau) / 2);
    return {
      outcome: "charges",
      chargeTimeS: tau * Math.log(100),
      spanS: 10 * tau,
      outputV: (t) => vin - currentA(t) * rt,
      currentA,
      powerW: (t) => currentA(t) ** 2 * d.channelOhm,
      energyJ,
      peakCurrentA: i0,
      peakPowerW: i0 * i0 * d.channelOhm,
      peakPowerVdsV: i0 * d.channelOhm,
    };
  }
  if (d.kind === "slew") {
    const s = d.slewVPerS;
    const t1 = vin / s;
    const outputV = (t: number) => Math.min(vin, s * Math.max(0, t));
    const currentA = (t: number) => (t < t1 ? cap * s : 0) + loadA(load, outputV(t));
    const powerW = (t: number) => (vin - outputV(t)) * currentA(t);
    let energyJ = 0.5 * cap * vin * vin;
    if (load.kind === "constant-current") energyJ += (load.currentA * vin * vin) / (2 * s);
    if (load.kind === "resistive") energyJ += (vin * vin * vin) / (6 * load.resistanceOhm * s);
    // P = (Vin − v)(C·s + v/RL) peaks inside the ramp at v* = (Vin − C·s·RL)/2 where that is above 0.
    let peakPowerW = powerW(0);
    let peakPowerVdsV = vin;
    if (load.kind === "resistive") {
      const vStar = (vin - cap * s * load.resistanceOhm) / 2;
      if (vStar > 0 && powerW(vStar / s) > peakPowerW) {
        peakPowerW = powerW(vStar / s);
        peakPowerVdsV = vin - vStar;
      }
    }
    return {
      outcome: "charges",
      chargeTimeS: t1,
      spanS: t1,
      outputV,
      currentA,
      powerW,
      energyJ,
      peakCurrentA: cap * s + loadA(load, vin),
      peakPowerW,
      peakPowerVdsV,
    };
  }
  const lim = d.limitA;
  const atVin = loadA(load, vin);
  if (atVin >= lim) {
    const stallV = load.kind === "resistive" ? Math.min(vin, lim * load.resistanceOhm) : 0;
    return {
      outcome: "stalls",
      stallV,
      stallPowerW: (vin - stallV) * lim,
      reason: `the load draws ${round(atVin)} A at ${round(vin)} V, at least the switch's current limit ${round(lim)} A: the output stalls at ${round(stallV)} V with the switch limiting`,
    };
  }
  let chargeTimeS: number;
  let outputV: (t: number) => number;
  let energyJ: number;
  if (load.kind === "resistive") {
    const rl = load.resistanceOhm;
    const tau = rl * cap;
    chargeTimeS = -tau * Math.log1p(-vin / (lim * rl));
    outputV = (t) => Math.min(vin, -lim * rl * Math.expm1(-Math.max(0, t) / tau));
    energyJ = lim * (vin * chargeTimeS - lim * rl * chargeTimeS + rl * cap * vin);
  } else {
    const net = lim - loadA(load, 0);
    chargeTimeS = (cap * vin) / net;
    outputV = (t) => Math.min(vin, (net * Math.max(0, t)) / cap);
    energyJ = (lim * vin * chargeTimeS) / 2;
  }
  const tEnd = chargeTimeS;
  const currentA = (t: number) => (t < tEnd ? lim : loadA(load, vin));
  return {
    outcome: "charges",
    chargeTimeS,
    spanS: chargeTimeS,
    outputV,
    currentA,
    powerW: (t) => (t < tEnd ? (vin - outputV(t)) * lim : 0),
    energyJ,
    peakCurrentA: lim,
    peakPowerW: vin * lim,
    peakPowerVdsV: vin,
  };
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
