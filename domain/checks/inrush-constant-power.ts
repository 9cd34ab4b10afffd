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
 * A start voltage at or above Vin: the converter never runs during the charge (no load).
 * Checked against RK4 of C·dV/dt = I − P/V, the trapezoid ∫P dt and conservation of energy
 * (source = capacitor + load + pass element) in test/domain/checks/inrush-constant-power.test.ts.
 */
export function constantPowerCharge(c: InrushCircuit, powerW: number, startV: number): InrushCharge {
  const vin = c.inputV;
  const cap = c.capacitanceF;
  const d = c.drive;
  const draws = startV < vin;
  const loadA = (v: number) => (draws && v >= startV && v > 0 ? powerW / v : 0);
  if (d.kind === "uncontrolled")
    throw new Error("constantPowerCharge: an uncontrolled charge beside a constant-power load is not modelled");
  if (d.kind === "slew") {
    if (draws && !(startV > 0))
      throw new Error("constantPowerCharge: a slew beside a constant-power load needs its start voltage above 0 V");
    const s = d.slewVPerS;
    const t1 = vin / s;
    const outputV = (t: number) => Math.min(vin, s * Math.max(0, t));
    const currentA = (t: number) => (t < t1 ? cap * s : 0) + loadA(outputV(t));
    const powerW_ = (t: number) => (vin - outputV(t)) * currentA(t);
    const loadE = draws ? (powerW / s) * (vin * Math.log(vin / startV) - (vin - startV)) : 0;
    const atStartW = draws ? (vin - startV) * (cap * s + powerW / startV) : 0;
    const atZeroW = vin * cap * s;
    return {
      outcome: "charges",
      chargeTimeS: t1,
      spanS: t1,
      outputV,
      currentA,
      powerW: powerW_,
      energyJ: 0.5 * cap * vin * vin + loadE,
      peakCurrentA: cap * s + (draws ? powerW / startV : 0),
      peakPowerW: Math.max(atZeroW, atStartW),
      peakPowerVdsV: atStartW > atZeroW ? vin - startV : vin,
    };
  }
  const lim = d.limitA;
  if (draws && lim * startV <= powerW) {
    return {
      outcome: "stalls",
      stallV: startV,
      stallPowerW: (vin - startV) * lim,
      reason: `the converter draws ${round(powerW)} W, at its start voltage ${round(startV)} V at least the switch's current limit ${round(lim)} A (${round(lim * startV)} W there): each time it starts it pulls the output back below its start voltage, and the output cycles at the converter's undervoltage lockout instead of charging to ${round(vin)} V`,
    };
  }
  const vs = draws ? startV : vin;
  const t1 = (cap * vs) / lim;
  const logTerm = draws ? Math.log((lim * vin - powerW) / (lim * vs - powerW)) : 0;
  const p = draws ? powerW : 0;
  const t2 = (cap / lim) * (vin - vs + (p / lim) * logTerm);
  const chargeTimeS = t1 + t2;
  /** Time at which the output reaches v (Vs ≤ v ≤ Vin): t1 + (C/I)·[(v − Vs) + (P/I)·ln((I·v − P)/(I·Vs − P))]. */
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

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
