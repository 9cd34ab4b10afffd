import type { AcBridgeCircuit, Snapshot } from "./ac-bridge-circuit.js";
import { type Acc, raiseReverse } from "./ac-bridge-accumulators.js";
import { type OffDecay, offMoments, offNode, offOutV, onsetS } from "./ac-bridge-off-interval.js";

/**
 * The off interval from the off node s0 at t to the onset of conduction or t1, in closed form
 * (ac-bridge-off-interval.ts): its integrals (no line current; the capacitor, its ESR and the
 * load exchange the stored energy exactly), trace nodes at most T/50 apart, and the end node.
 * Undefined when conduction starts at t already (the general step takes it). The pair's drop at
 * zero current is taken at the supply of the interval's start, as the general step takes the laws
 * at the supply of each step's start.
 */
export function offStep(
  c: AcBridgeCircuit,
  d: OffDecay,
  s0: Snapshot,
  t: number,
  t1: number,
  period: number,
  acc: Acc,
  trace: Snapshot[] | undefined,
): Snapshot | "collapse" | undefined {
  const laws = c.pairLaws(s0.capV);
  const positive = Math.sin(2 * Math.PI * c.frequencyHz * (0.5 * (t + t1))) >= 0;
  const [la, lb] = positive ? laws.positive : laws.negative;
  const tOn = onsetS(c, d, t, t1, s0.outV, la.dropV(0) + lb.dropV(0));
  const tEnd = tOn ?? t1;
  const span = tEnd - t;
  if (!(span > 0)) return undefined;
  const out0 = s0.outV;
  const outEnd = offOutV(d, out0, span);
  if (!(outEnd > 0)) return "collapse";
  const { vS, v2S } = offMoments(d, out0, span);
  const esr = c.esrOhm;
  // capA = −ℓ(outV), capV = outV − ESR·capA.
  const capA2s = d.kind === "resistive" ? v2S / (d.loadOhm * d.loadOhm) : d.currentA * d.currentA * span;
  acc.esrEnergyJ += esr * capA2s;
  acc.capA2s += capA2s;
  acc.capEnergyJ +=
    d.kind === "resistive" ? (-(1 + esr / d.loadOhm) * v2S) / d.loadOhm : -d.currentA * (vS + esr * d.currentA * span);
  acc.loadEnergyJ += d.kind === "resistive" ? v2S / d.loadOhm : d.currentA * vS;
  acc.loadAs += d.kind === "resistive" ? vS / d.loadOhm : d.currentA * span;
  acc.outVs += vS;
  // The output falls monotonically: its extremes are the ends.
  for (const v of [out0, outEnd]) {
    if (v < acc.outMinV) acc.outMinV = v;
    if (v > acc.outMaxV) acc.outMaxV = v;
  }
  for (let k = 0; k < 4; k += 1) raiseReverse(acc, k, out0);
  const end = offNode(c, d, tEnd, outEnd);
  if (trace !== undefined) {
    const pieces = Math.max(1, Math.ceil((50 * span) / period));
    for (let k = 1; k < pieces; k += 1)
      trace.push(offNode(c, d, t + (k * span) / pieces, offOutV(d, out0, (k * span) / pieces)));
    trace.push(end);
  }
  return end;
}
