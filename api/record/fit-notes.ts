import type { FitQuality } from "../../domain/fit/fit-quality.js";

/** A least-squares curve fit a call made, as its verdict record lists it. */
export interface FitNote {
  /** where in the input the points are (`stage.diode.points`) */
  readonly path: string;
  readonly unit: string;
  readonly points: number;
  readonly rmsResidual: number;
  /** model − point at the worst point, in `unit` */
  readonly worstResidual: number;
  readonly worstPoint: number;
  readonly worstFraction: number;
  readonly boundFraction: number;
  /** beyond its bound, taken because the caller set acceptFit */
  readonly accepted: boolean;
}

let sink: FitNote[] | undefined;

/** Tell the call being recorded of a fit (api/map/fit-gate.ts; a replayed catalog model's fits too). */
export function noteFit(note: FitNote): void {
  sink?.push(note);
}

/** The note of a fit's quality gate. */
export function fitNoteOf(q: FitQuality, path: readonly (string | number)[], unit: string, points: number): FitNote {
  return {
    path: path.join("."),
    unit,
    points,
    rmsResidual: q.rms,
    worstResidual: q.worst,
    worstPoint: q.worstIndex,
    worstFraction: q.worstFraction,
    boundFraction: q.boundFraction,
    accepted: q.worstFraction > q.boundFraction,
  };
}

/**
 * `f()` and the fits noted while it ran (synchronously: every handler and mapping is). Nested
 * collections each see their own fits; the outer one is restored after.
 */
export function collectingFits<T>(f: () => T): { readonly value: T; readonly fits: readonly FitNote[] } {
  const outer = sink;
  const fits: FitNote[] = [];
  sink = fits;
  try {
    return { value: f(), fits };
  } finally {
    sink = outer;
  }
}
