import type { InrushCharge, InrushCircuit } from "./inrush.js";

/**
 * The inrush charge beside a constant-power load (a DC-DC converter's input), in closed form.
 *
 * The converter draws nothing below its start voltage Vs (its undervoltage lockout) and P/V above
 * it (a constant-power input: a regulator holding its output draws more as its input falls), so
 * the current left for the capacitor is the drive's less P/V.
 *
 * - slew s (a gate-controlled dV/dt): V = s·t to Vin at T = Vin/s; the pass element carries
 *   I = C·s + P/V (V ≥ Vs) and loses (Vin − V)·I. Energy: ½·C·Vin² (the capacitor's share, as with
 *   no load) plus ∫(Vin − V)·P/V dt = (P/s)·[Vin·ln(Vin/Vs) − (Vin − Vs)]. The loss falls along the
 *   ramp above Vs (d/dV of (Vin − V)(C·s + P/V) is −C·s − P·Vin/V² < 0), so it peaks at 0 V
 *   (Vin·C·s) or where the load starts ((Vin − Vs)·(C·s + P/Vs)), the current at Vs.
 * - current limit I: C·dV/dt = I up to Vs (t1 = C·Vs/I), then C·dV/dt = I − P/V, i.e.
 *   dt = C·V·dV/(I·V − P) = (C/I)·[1 + (P/I)/(V − P/I)]·dV, so from Vs to Vin
 *   t2 = (C/I)·[(Vin − Vs) + (P/I)·ln((I·Vin − P)/(I·Vs − P))]. The switch loses (Vin − V)·I:
 *   E = I·(Vin·T − ∫V dt) with ∫V dt = C·Vs²/(2I) + C·[(Vin² − Vs²)/(2I) + P·(Vin − Vs)/I²
 *   + (P²/I³)·ln((I·Vin − P)/(I·Vs − P))] (V²/(I·V − P) = V/I + P/I² + (P²/I²)/(I·V − P)).
 *   V(t) has no elementary inverse above Vs: it is found by bisection of the monotone t(V).
 *   Where I·Vs ≤ P the converter takes at least the whole limit the moment it starts: the output
 *   falls back below its start, the converter stops, the output recharges to Vs and the cycle
 *   repeats at the lockout (with its hysteresis): the output never charges (stalls at Vs, the
 *   switch held limiting at (Vin − Vs)·I: conservative, the real duty is lower).
 * - fully on at once through Rt = Rch + Rloop: an RC charge V = Vin·(1 − e^(−t/(Rt·C))) up to Vs,
 *   then C·dV/dt = (Vin − V)/Rt − P/V = −(V − V1)(V − V2)/(Rt·V) with the roots
 *   V1,2 = [Vin ∓ √(Vin² − 4·P·Rt)]/2: the output settles at V2 where it charges at all
 *   (V1 < Vs < V2), with
 *   t(V) = t1 + Rt·C/(V2 − V1)·[V1·ln((V − V1)/(Vs − V1)) + V2·ln((V2 − Vs)/(V2 − V))], done at 99 %
 *   of V2. The channel's loss above its steady I_ss²·Rch (I_ss = (Vin − V2)/Rt, the load's own
 *   conduction, as for the other loads): (I² − I_ss²) = (V2 − V)(2·Vin − V − V2)/Rt² cancels the
 *   root at V2, so E = Rch·(C/Rt)·[Vin·Vs − Vs²/2 + Vin·(V2 − Vs) − (V2² − Vs²)/2
 *   + V1·Vin·ln((V2 − V1)/(Vs − V1))] − Rch·I_ss²·t1 (P → 0: ½·C·Vin²·Rch/Rt). No roots, or Vs
 *   outside (V1, V2): the converter pulls the output back below its start, a stall at Vs.
 * The dispatcher (inrush.ts) sends a converter that starts at or above Vin to the no-load charge.
 * Checked against RK4 of the three ODEs, the trapezoid ∫P dt and conservation of energy
 * (source = capacitor + load + pass element) in test/domain/checks/inrush-constant-power.test.ts.
 */
export function constantPowerCharge(c: InrushCircuit, powerW: number, startV: number): InrushCharge {
  const vin = c.inputV;
  const cap = c.capacitanceF;
  const d = c.drive;
  if (!(startV < vin)) throw new Error("constantPowerCharge: the converter starts at or above the input");
  const loadA = (v: number) => (v >= startV && v > 0 ? powerW / v : 0);
  if (d.kind === "uncontrolled") return uncontrolledCharge(c, d.channelOhm, d.channelOhm + d.loopOhm, powerW, startV);
  if (d.kind === "slew") {
    if (!(startV > 0))
      throw new Error("constantPowerCharge: a slew beside a constant-power load needs its start voltage above 0 V");
    const s = d.slewVPerS;
    const t1 = vin / s;
    const outputV = (t: number) => Math.min(vin, s * Math.max(0, t));
    const currentA = (t: number) => (t < t1 ? cap * s : 0) + loadA(outputV(t));
    const powerW_ = (t: number) => (vin - outputV(t)) * currentA(t);
    const loadE = (powerW / s) * (vin * Math.log(vin / startV) - (vin - startV));
    const atStartW = (vin - startV) * (cap * s + powerW / startV);
    const atZeroW = vin * cap * s;
    return {
      outcome: "charges",
      chargeTimeS: t1,
      spanS: t1,
      outputV,
      currentA,
      powerW: powerW_,
      energyJ: 0.5 * cap * vin * vin + loadE,
      peakCurrentA: cap * s + powerW / startV,
      peakPowerW: Math.max(atZeroW, atStartW),
      peakPowerVdsV: atStartW > atZeroW ? vin - startV : vin,
    };
  }
  const lim = d.limitA;
  if (lim * startV <= powerW) {
    return {
      outcome: "stalls",
      stallV: startV,
      stallPowerW: (vin - startV) * lim,
      reason: `the converter draws ${round(powerW)} W, at its start voltage ${round(startV)} V at least the switch's current limit ${round(lim)} A (${round(lim * startV)} W there): each time it starts it pulls the output back below its start voltage, and the output cycles at the converter's undervoltage lockout instead of charging to ${round(vin)} V`,
    };
  }
  const vs = startV;
  const t1 = (cap * vs) / lim;
  const logTerm = Math.log((lim * vin - powerW) / (lim * vs - powerW));
  const p = powerW;
  const t2 = (cap / lim) * (vin - vs + (p / lim) * logTerm);
  const chargeTimeS = t1 + t2;
  /** Time the output reaches v (Vs ≤ v ≤ Vin): t1 + (C/I)·[(v − Vs) + (P/I)·ln((I·v − P)/(I·Vs − P))]. */
  const timeAtV = (v: number) => t1 + (cap / lim) * (v - vs + (p / lim) * Math.log((lim * v - p) / (lim * vs - p)));
  const outputV = (t: number) => {
    if (t <= 0) return 0;
    if (t < t1) return (lim * t) / cap;
    if (t >= chargeTimeS) return vin;
    let lo = vs;
    let hi = vin;
    for (let k = 0; k < 60; k += 1) {
      const mid = 0.5 * (lo + hi);
      if (timeAtV(mid) < t) lo = mid;
      else hi = mid;
    }
    return 0.5 * (lo + hi);
  };
  const integralV =
    (cap * vs * vs) / (2 * lim) +
    cap * ((vin * vin - vs * vs) / (2 * lim) + (p * (vin - vs)) / lim ** 2 + (p * p * logTerm) / lim ** 3);
  return {
    outcome: "charges",
    chargeTimeS,
    spanS: chargeTimeS,
    outputV,
    currentA: (t) => (t < chargeTimeS ? lim : loadA(vin)),
    powerW: (t) => (t < chargeTimeS ? (vin - outputV(t)) * lim : 0),
    energyJ: lim * (vin * chargeTimeS - integralV),
    peakCurrentA: lim,
    peakPowerW: vin * lim,
    peakPowerVdsV: vin,
  };
}

/** Fully on at once through the loop Rt (the channel Rch of it) beside the converter (see above). */
function uncontrolledCharge(c: InrushCircuit, rch: number, rt: number, powerW: number, startV: number): InrushCharge {
  const vin = c.inputV;
  const tau = rt * c.capacitanceF;
  const disc = vin * vin - 4 * powerW * rt;
  const v1 = disc > 0 ? (vin - Math.sqrt(disc)) / 2 : vin / 2;
  const v2 = disc > 0 ? (vin + Math.sqrt(disc)) / 2 : vin / 2;
  if (!(disc > 0 && v1 < startV && startV < v2)) {
    const atStartA = (vin - startV) / rt;
    return {
      outcome: "stalls",
      stallV: startV,
      stallPowerW: atStartA * atStartA * rch,
      reason: `the converter draws ${round(powerW)} W from its start voltage ${round(startV)} V, more than the loop of ${round(rt)} ohm passes there (${round((vin - startV) * atStartA)} W less its own drop): each time it starts it pulls the output back below its start voltage, and the output cycles at the converter's undervoltage lockout instead of charging`,
    };
  }
  const t1 = -tau * Math.log1p(-startV / vin);
  const timeAtV = (v: number) =>
    t1 + (tau / (v2 - v1)) * (v1 * Math.log((v - v1) / (startV - v1)) + v2 * Math.log((v2 - startV) / (v2 - v)));
  const doneV = 0.99 * v2;
  const chargeTimeS = doneV > startV ? timeAtV(doneV) : -tau * Math.log1p(-doneV / vin);
  const spanS = timeAtV(v2 - 1e-6 * (v2 - startV));
  const outputV = (t: number) => {
    if (t <= 0) return 0;
    if (t < t1) return -vin * Math.expm1(-t / tau);
    let lo = startV;
    let hi = v2;
    for (let k = 0; k < 60; k += 1) {
      const mid = 0.5 * (lo + hi);
      if (timeAtV(mid) < t) lo = mid;
      else hi = mid;
    }
    return 0.5 * (lo + hi);
  };
  const currentA = (t: number) => (vin - outputV(t)) / rt;
  const iss = (vin - v2) / rt;
  const i0 = vin / rt;
  const squared =
    (c.capacitanceF / rt) *
    (vin * startV -
      (startV * startV) / 2 +
      vin * (v2 - startV) -
      (v2 * v2 - startV * startV) / 2 +
      v1 * vin * Math.log((v2 - v1) / (startV - v1)));
  return {
    outcome: "charges",
    chargeTimeS,
    spanS,
    outputV,
    currentA,
    powerW: (t) => currentA(t) ** 2 * rch,
    energyJ: rch * (squared - iss * iss * t1),
    peakCurrentA: i0,
    peakPowerW: i0 * i0 * rch,
    peakPowerVdsV: i0 * rch,
  };
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
