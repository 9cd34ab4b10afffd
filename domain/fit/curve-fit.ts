import type { FitQuality } from "./fit-quality.js";

/**
 * A fitted curve law: its parameters, their standard errors where the points over-determine them
 * (from the Jacobian at the solution, least-squares.ts), how well it reproduces the points, and
 * the modelled value at each point in the caller's order. Or a refusal naming the points at fault.
 */
export type CurveFit<P> =
  | {
      readonly ok: true;
      readonly params: P;
      readonly standardErrors: { readonly [K in keyof P]?: number };
      readonly quality: FitQuality;
      readonly modelled: readonly number[];
    }
  | { readonly ok: false; readonly reason: string; readonly points: readonly number[] };

export const refuse = (reason: string, points: readonly number[] = []) => ({ ok: false as const, reason, points });

/**
 * The first pair of neighbours (in x, caller's indices) along which y falls by more than the share
 * `tolerance` of the lower-x value, for a curve that every law of its kind has rising with x; a
 * smaller dip (reading noise on a flat stretch) is left to the fit and its gate. Points with equal
 * x are not compared.
 */
export function firstFall(
  xs: readonly number[],
  ys: readonly number[],
  tolerance: number,
): readonly [number, number] | undefined {
  const order = xs.map((_, i) => i).sort((a, b) => (xs[a] ?? 0) - (xs[b] ?? 0));
  for (let k = 1; k < order.length; k += 1) {
    const a = order[k - 1] ?? 0;
    const b = order[k] ?? 0;
    if ((xs[b] ?? 0) > (xs[a] ?? 0) && (ys[b] ?? 0) < (ys[a] ?? 0) * (1 - tolerance)) return [a, b];
  }
  return undefined;
}
