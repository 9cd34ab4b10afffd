/**
 * Two sources feeding one node, each behind its own resistance: a steady source Vb behind Rb (a
 * battery and its wiring) and a generator whose open-circuit voltage is Vg(t) = g0 + A·e^(−t/τ)
 * behind Ri (a test pulse riding on the supply: g0 = Vb). Seen from the node, by superposition
 * (each source with the other shorted) the pair is one source behind one resistance:
 *
 *   Vth(t) = (Vb·Ri + Vg(t)·Rb)/(Ri + Rb) = (Vb·Ri + g0·Rb)/(Ri + Rb) + A·Rb/(Ri + Rb)·e^(−t/τ),
 *   Rth    = Ri·Rb/(Ri + Rb)   (Ri ‖ Rb),
 *
 * a constant plus an exponential with the generator's own τ: the form the series R-L-C closed form
 * takes as its source (rlc-series.ts, sourceDecay). Rb → ∞ gives the generator alone (Vth = Vg,
 * Rth = Ri); Rb = 0 gives the battery alone (Vth = Vb, Rth = 0: the pulse does not move the node).
 * Source: Thevenin's theorem and superposition (closed form; test/domain/physics/two-source-thevenin.test.ts
 * checks it against ngspice on the two-source circuit).
 */
export interface TwoSources {
  readonly batteryV: number;
  /** The battery's resistance with its wiring, ohm (≥ 0). */
  readonly batteryOhm: number;
  /** The generator's open-circuit base g0, V. */
  readonly generatorBaseV: number;
  /** The generator's signed exponential amplitude A above its base, V. */
  readonly generatorAmplitudeV: number;
  /** The generator's internal resistance Ri, ohm (> 0). */
  readonly generatorOhm: number;
}

export interface TheveninSource {
  /** The constant part of Vth, V: the level it decays to. */
  readonly finalV: number;
  /** Vth at t = 0+, V: finalV plus the scaled amplitude. */
  readonly startV: number;
  /** Rth = Ri ‖ Rb, ohm. */
  readonly resistanceOhm: number;
}

export function twoSourceThevenin(s: TwoSources): TheveninSource {
  const sum = s.generatorOhm + s.batteryOhm;
  const finalV = (s.batteryV * s.generatorOhm + s.generatorBaseV * s.batteryOhm) / sum;
  const startV = finalV + (s.generatorAmplitudeV * s.batteryOhm) / sum;
  return { finalV, startV, resistanceOhm: (s.generatorOhm * s.batteryOhm) / sum };
}
