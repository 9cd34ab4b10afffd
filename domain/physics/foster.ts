/**
 * Transient thermal impedance as a Foster network (JEDEC JESD51-14 practice; docs/references.md):
 *   Zth(t) = Σ Ri·(1 − exp(−t/τi)),  τi = Ri·Ci,
 * with superposition for a pulse train: ΔTj(t) = Σk Pk·[Zth(t − tk,start) − Zth(t − tk,end)].
 */
export interface FosterTerm {
  readonly rKPerW: number;
  readonly tauS: number;
}

export function zthKPerW(net: readonly FosterTerm[], tS: number): number {
  if (tS <= 0) return 0;
  let z = 0;
  for (const term of net) z += term.rKPerW * -Math.expm1(-tS / term.tauS);
  return z;
}

export function steadyRthKPerW(net: readonly FosterTerm[]): number {
  return net.reduce((s, t) => s + t.rKPerW, 0);
}

/** A rectangular power pulse from startS to endS. */
export interface PowerPulse {
  readonly startS: number;
  readonly endS: number;
  readonly powerW: number;
}

/** Junction rise above ambient at time tS for a train of rectangular pulses, by superposition. */
export function pulseTrainRiseK(net: readonly FosterTerm[], pulses: readonly PowerPulse[], tS: number): number {
  let rise = 0;
  for (const p of pulses) rise += p.powerW * (zthKPerW(net, tS - p.startS) - zthKPerW(net, tS - p.endS));
  return rise;
}

/**
 * Advance the node rises of a Foster network over dtS with the power held at powerW — exact for a
 * constant power over the step: ΔTi ← ΔTi·e^(−dt/τi) + Ri·P·(1 − e^(−dt/τi)).
 */
export function stepFoster(
  net: readonly FosterTerm[],
  rises: readonly number[],
  powerW: number,
  dtS: number,
): number[] {
  return net.map((term, i) => {
    const decay = Math.exp(-dtS / term.tauS);
    return (rises[i] ?? 0) * decay + term.rKPerW * powerW * (1 - decay);
  });
}

/** N equal rectangular pulses of powerW, each widthS long, starting every periodS (widthS ≤ periodS). */
export interface PeriodicTrain {
  readonly powerW: number;
  readonly widthS: number;
  readonly periodS: number;
  readonly count: number;
}

/**
 * Junction rise of a Foster network under a periodic pulse train, in closed form (superposition of
 * the step responses summed as a geometric series, per term, with a = e^(−tp/τ), b = e^(−T/τ)):
 *   at the end of pulse n:          ΔTi = Ri·P·(1 − a)·(1 − bⁿ)/(1 − b)
 *   periodic steady state (n → ∞):  ΔTi = Ri·P·(1 − a)/(1 − b), and its valley that peak·b/a
 * Every term rises through a pulse and falls between pulses, so the train's highest rise is at the
 * end of its last pulse; the steady-state peak bounds every finite train.
 */
export function periodicTrainRiseK(
  net: readonly FosterTerm[],
  train: PeriodicTrain,
): { readonly lastPeakK: number; readonly steadyPeakK: number; readonly steadyValleyK: number } {
  let lastPeakK = 0;
  let steadyPeakK = 0;
  let steadyValleyK = 0;
  for (const term of net) {
    const a = Math.exp(-train.widthS / term.tauS);
    const b = Math.exp(-train.periodS / term.tauS);
    // (1 − bⁿ)/(1 − b) by expm1 so a long τ (b → 1) keeps its digits.
    const oneMinusB = -Math.expm1(-train.periodS / term.tauS);
    const rise = term.rKPerW * train.powerW * -Math.expm1(-train.widthS / term.tauS);
    const series = oneMinusB > 0 ? -Math.expm1(-(train.count * train.periodS) / term.tauS) / oneMinusB : train.count;
    lastPeakK += rise * series;
    const steady = oneMinusB > 0 ? rise / oneMinusB : term.rKPerW * train.powerW * (train.widthS / train.periodS);
    steadyPeakK += steady;
    steadyValleyK += a > 0 ? steady * (b / a) : 0;
  }
  return { lastPeakK, steadyPeakK, steadyValleyK };
}
