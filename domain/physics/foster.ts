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
export function stepFoster(net: readonly FosterTerm[], rises: readonly number[], powerW: number, dtS: number): number[] {
  return net.map((term, i) => {
    const decay = Math.exp(-dtS / term.tauS);
    return (rises[i] ?? 0) * decay + term.rKPerW * powerW * (1 - decay);
  });
}
