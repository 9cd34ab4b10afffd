import { availableParallelism, cpus, loadavg } from "node:os";
/** Rows of the bench table and the statistics of repeated runs. */
export interface Row {
  readonly part: string;
  readonly metric: string;
  readonly value: number;
  readonly unit: string;
  readonly baseline?: string;
  readonly ratio?: number;
  /** the lowest and highest of the runs' ratios (or values, where there is no ratio) */
  readonly spread?: readonly [number, number];
  readonly target?: string;
  readonly pass?: boolean;
}

/** A part's rows and its raw figures (kept in bench/results.json under `details`). */
export interface PartResult {
  readonly rows: Row[];
  readonly details: unknown;
}

export const round = (x: number, d = 2) => Number(x.toFixed(d));

/** Where and how a bench ran: the machine, the Node version, the host's load at the start and the end, its seconds. */
export function measuredOn(loadAverageAtStart: number[], t0: number) {
  return {
    at: new Date().toISOString(),
    cores: availableParallelism(),
    cpu: cpus()[0]?.model ?? "unknown",
    node: process.version,
    loadAverageAtStart,
    loadAverageAtEnd: loadavg().map((x) => round(x)),
    seconds: round((performance.now() - t0) / 1000, 1),
  };
}

export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 === 1 ? (s[m] as number) : ((s[m - 1] as number) + (s[m] as number)) / 2;
}

/** Median and [min, max] of the paired ratios a[i] / b[i] of alternating runs. */
export function pairedRatio(a: readonly number[], b: readonly number[]): { median: number; spread: [number, number] } {
  const r = a.map((x, i) => x / (b[i] as number));
  return { median: median(r), spread: [Math.min(...r), Math.max(...r)] };
}
