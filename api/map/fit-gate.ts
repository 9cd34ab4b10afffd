import { TRPCError } from "@trpc/server";
import { beyondBoundReason, describeFit, type FitQuality, fitPasses } from "../../domain/fit/fit-quality.js";
import { InputProblem } from "../input-problem.js";
import { fitNoteOf, noteFit } from "../record/fit-notes.js";

/** A fit the points cannot give: one issue per offending point (or at the points when none is singled out). */
export function refusedFit(path: (string | number)[], message: string, points: readonly number[]): TRPCError {
  const issues = points.length === 0 ? [{ path, message }] : points.map((i) => ({ path: [...path, i], message }));
  return new TRPCError({ code: "BAD_REQUEST", message, cause: new InputProblem("fit-failed", message, issues) });
}

/**
 * The quality gate of a least-squares fit: beyond its bound it is refused, naming the worst point
 * and its residual, and so is a fit whose solver stopped before converging (its cap, a stall), unless the caller
 * accepts it (acceptFit); either way the sentence for the result's `assumptions` comes back, and
 * the fit is noted for the call's verdict record.
 */
export function gateFit(
  q: FitQuality,
  accept: boolean | undefined,
  path: (string | number)[],
  what: string,
  unit: string,
  points: number,
  describePoint: (i: number) => string,
): string {
  if (!fitPasses(q) && accept !== true)
    throw refusedFit(path, `${what}: ${beyondBoundReason(q, unit, describePoint)}`, [q.worstIndex]);
  noteFit(fitNoteOf(q, path, unit, points));
  return describeFit(what, q, unit, points);
}
