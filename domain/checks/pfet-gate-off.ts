import { firstCrossing, type Linear2, outputV, type RlcLoop, stateAt, type Vec2 } from "../physics/rlc-series.js";

/** Steps of the lagged gate over the searched span (fixed: a caller cannot enlarge it). */
export const GATE_LAG_STEPS = 20_000;

/**
 * When a P-FET whose gate is tied to ground turns its channel off as the output falls: its
 * |Vgs| = u follows the output (limited by the gate clamp) through the gate resistor charging the
 * gate capacitance, a first-order lag
 *   τg·du/dt = min(v_out(t), Vclamp) − u,  τg = Rg·Qg/Vgs(Qg)  (the gate charge over the gate
 * voltage it is given at: the gate's mean capacitance; the coupling of the input's step through
 * Cgd is not modelled),
 * and the channel conducts until u falls below its threshold. τg = 0: u is the output itself, and
 * the crossing is the closed form's (rlc-series.ts firstCrossing). τg > 0: u is stepped exactly for
 * a target linear over each of GATE_LAG_STEPS steps across the span (the output from the closed
 * form at the step ends), the crossing placed by linear interpolation within its step. Returns the
 * time the channel turns off, or undefined when it stays on over the span.
 */
export function gateOffTime(
  loop: RlcLoop,
  s: Linear2,
  x0: Vec2,
  gate: { readonly thresholdV: number; readonly clampV?: number | undefined; readonly lagS: number },
  spanS: number,
): number | undefined {
  const target = (t: number) => {
    const v = outputV(loop, stateAt(s, x0, t));
    return gate.clampV === undefined ? v : Math.min(v, gate.clampV);
  };
  if (!(gate.lagS > 0)) {
    if (gate.clampV !== undefined && gate.clampV <= gate.thresholdV) return 0;
    const k = 1 / (1 + loop.esrOhm * loop.loadConductanceS);
    return firstCrossing(s, x0, [k * loop.esrOhm, k], gate.thresholdV + k * loop.esrOhm * loop.loadCurrentA, spanS);
  }
  const h = spanS / GATE_LAG_STEPS;
  const decay = Math.exp(-h / gate.lagS);
  const ramp = (gate.lagS / h) * -Math.expm1(-h / gate.lagS);
  let u = target(0);
  if (u < gate.thresholdV) return 0;
  let t0 = target(0);
  for (let n = 0; n < GATE_LAG_STEPS; n += 1) {
    const t1 = target((n + 1) * h);
    // Exact for a target linear from t0 to t1 over the step: u(h) = t1 − (t1 − t0)·ramp + (u − t0)·decay.
    const next = t1 - (t1 - t0) * ramp + (u - t0) * decay;
    if (next < gate.thresholdV) return (n + (u - gate.thresholdV) / (u - next)) * h;
    u = next;
    t0 = t1;
  }
  return undefined;
}
