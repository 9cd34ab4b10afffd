import type { Snapshot } from "./ac-bridge-circuit.js";
import type { PeriodIntegrals } from "./ac-bridge-period-types.js";

/**
 * Half-wave symmetry of a symmetric full bridge. The source is half-wave antisymmetric,
 * e(t + T/2) = −e(t); when the element that starts each pair is the same law in both pairs (and
 * so is the second), the circuit equations are unchanged under t → t + T/2 with the line current
 * and the conducting pair reversed. The periodic state therefore satisfies x(t + T/2) = M·x(t),
 * M = diag(1, −1) on [capV, lineA] (the reservoir voltage repeats every half period, the line
 * current changes sign): it is the fixed point of the half-period map M·H(x), and the second
 * half period is the first one mirrored (the odd-harmonic property of half-wave symmetric
 * waveforms; common practice in the periodic steady state of rectifiers). Shooting on H does
 * half the integration of shooting on the full period.
 */
export function mirrorState(x: readonly number[]): number[] {
  return x.length > 1 ? [x[0] ?? 0, -(x[1] ?? 0)] : [x[0] ?? 0];
}

/** A node of the first half period as the matching node of the second (t + T/2, reversed line). */
export function mirrorSnapshot(s: Snapshot, halfS: number): Snapshot {
  const pair: 1 | -1 | 0 = s.pair === 1 ? -1 : s.pair === -1 ? 1 : 0;
  return {
    ...s,
    t: s.t + halfS,
    sourceV: -s.sourceV,
    lineA: -s.lineA,
    pair,
    inductorV: -s.inductorV,
    // Under the mirror b₁ → −b₁ and vL → −vL.
    dCapAdB1: -s.dCapAdB1,
    dVLdB0: -s.dVLdB0,
  };
}

/**
 * Whole-period integrals from those of the first half: circuit integrals (all even under the
 * mirror: e·i, i², vL·i, capacitor and load terms) double; the mirror swaps the pairs, so an
 * element's sum is its own plus its counterpart's in the other pair (slot k and k xor 2), and
 * its extremes are the larger of the two.
 */
export function wholeFromHalf(g: PeriodIntegrals): PeriodIntegrals {
  const sum = (a: readonly number[]) => a.map((v, k) => v + (a[k ^ 2] ?? 0));
  const max = (a: readonly number[]) => a.map((v, k) => Math.max(v, a[k ^ 2] ?? 0));
  return {
    sourceEnergyJ: 2 * g.sourceEnergyJ,
    lineA2s: 2 * g.lineA2s,
    sourceResistanceEnergyJ: 2 * g.sourceResistanceEnergyJ,
    inductorEnergyJ: 2 * g.inductorEnergyJ,
    esrEnergyJ: 2 * g.esrEnergyJ,
    capEnergyJ: 2 * g.capEnergyJ,
    capA2s: 2 * g.capA2s,
    loadEnergyJ: 2 * g.loadEnergyJ,
    loadAs: 2 * g.loadAs,
    outVs: 2 * g.outVs,
    elementAs: sum(g.elementAs),
    elementA2s: sum(g.elementA2s),
    elementEnergyJ: sum(g.elementEnergyJ),
    elementPeakA: max(g.elementPeakA),
    elementMaxReverseV: max(g.elementMaxReverseV),
    outMinV: g.outMinV,
    outMaxV: g.outMaxV,
    lineMaxA: g.lineMaxA,
  };
}

/** The whole period's nodes: the first half, then its mirror (without the repeated node at T/2). */
export function wholeTraceFromHalf(trace: readonly Snapshot[], periodS: number): Snapshot[] {
  const halfS = periodS / 2;
  const out = [...trace];
  for (let k = 1; k < trace.length; k += 1) {
    const s = trace[k];
    if (s !== undefined) out.push(mirrorSnapshot(s, halfS));
  }
  return out;
}
