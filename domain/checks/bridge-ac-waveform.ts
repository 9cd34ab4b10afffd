import type { Snapshot } from "../solve/ac-bridge-circuit.js";
import { SLOT } from "./bridge-ac-metrics.js";
import { BRIDGE_POSITIONS, type BridgePosition } from "./bridge-element.js";

/** One period of the AC bridge's steady state, column by column (same length each). */
export interface AcPeriodWaveform {
  /** From the rising zero of the source, s. */
  readonly timeS: readonly number[];
  readonly sourceV: readonly number[];
  readonly outputV: readonly number[];
  /** Forward current of each element, A (0 while its pair does not conduct). */
  readonly elementCurrentA: Readonly<Record<BridgePosition, readonly number[]>>;
  /** Integrator nodes of the converged period the samples were picked from. */
  readonly nodes: number;
}

/** Default number of evenly spaced sample times over the period. */
export const AC_WAVEFORM_POINTS = 400;

/** An element's current at an integrator node: the line current's magnitude while its pair conducts. */
export function nodeElementCurrentA(s: Snapshot, position: BridgePosition): number {
  const pair = SLOT[position] < 2 ? 1 : -1;
  return s.pair === pair ? Math.abs(s.lineA) : 0;
}

/**
 * One period of the converged steady state as samples: the integrator's own nodes of the last
 * period (ac-bridge-period.ts, TR-BDF2 — the nodes the period integrals and peaks were taken on),
 * all of them when there are at most `points`, else the node nearest each of `points` evenly
 * spaced times, plus the node of each element's current peak and of the output's minimum and
 * maximum (so the sampled peaks equal the reported peak currents and ripple exactly). No node is
 * interpolated or recomputed.
 */
export function acPeriodWaveform(
  trace: readonly Snapshot[],
  periodS: number,
  points = AC_WAVEFORM_POINTS,
): AcPeriodWaveform {
  // Nodes in time order, one per time (a step's end node is the next step's start node).
  const nodes = trace.filter((s, i) => i === 0 || s.t > (trace[i - 1]?.t ?? Number.NEGATIVE_INFINITY));
  const keep = new Set<number>();
  const n = Math.max(2, Math.floor(points));
  if (nodes.length <= n) for (let i = 0; i < nodes.length; i += 1) keep.add(i);
  else {
    let j = 0;
    for (let k = 0; k < n; k += 1) {
      const t = (periodS * k) / (n - 1);
      while (j + 1 < nodes.length && Math.abs((nodes[j + 1]?.t ?? 0) - t) <= Math.abs((nodes[j]?.t ?? 0) - t)) j += 1;
      keep.add(j);
    }
  }
  const argBest = (value: (s: Snapshot) => number): number => {
    let best = 0;
    nodes.forEach((s, i) => {
      if (value(s) > value(nodes[best] ?? s)) best = i;
    });
    return best;
  };
  for (const p of BRIDGE_POSITIONS) keep.add(argBest((s) => nodeElementCurrentA(s, p)));
  keep.add(argBest((s) => s.outV));
  keep.add(argBest((s) => -s.outV));
  const picked = [...keep]
    .sort((a, b) => a - b)
    .map((i) => nodes[i])
    .filter((s): s is Snapshot => s !== undefined);
  const column = (p: BridgePosition) => picked.map((s) => nodeElementCurrentA(s, p));
  return {
    timeS: picked.map((s) => s.t),
    sourceV: picked.map((s) => s.sourceV),
    outputV: picked.map((s) => s.outV),
    elementCurrentA: {
      line1High: column("line1High"),
      line2High: column("line2High"),
      line1Low: column("line1Low"),
      line2Low: column("line2Low"),
    },
    nodes: nodes.length,
  };
}
