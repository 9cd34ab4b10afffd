/**
 * A MOSFET's datasheet safe operating area: single-pulse lines of drain current against
 * drain-source voltage, one per pulse width, at a 25 °C case (the datasheet's convention).
 */
export interface SoaLine {
  readonly pulseWidthS: number;
  /** Points of the line, Vds ascending. */
  readonly points: readonly { readonly vdsV: number; readonly idA: number }[];
}

export type SoaCheck =
  | {
      readonly assessed: true;
      /** The rectangular pulse of the same energy at the peak power: width E/Ppeak, s. */
      readonly equivalentWidthS: number;
      readonly vdsV: number;
      readonly currentA: number;
      /** The lines' current at that Vds and width, derated to the starting junction, A. */
      readonly allowedA: number;
    }
  | { readonly assessed: false; readonly reason: string };

/** Log-log interpolation through (x, y) pairs, x ascending; flat below the first x, undefined above the last. */
function logLog(nodes: readonly (readonly [number, number])[], x: number): number | undefined {
  const first = nodes[0];
  if (first === undefined) return undefined;
  if (x <= first[0]) return first[1];
  for (let i = 1; i < nodes.length; i += 1) {
    const a = nodes[i - 1];
    const b = nodes[i];
    if (a === undefined || b === undefined || x > b[0]) continue;
    const f = Math.log(x / a[0]) / Math.log(b[0] / a[0]);
    return Math.exp(Math.log(a[1]) + f * Math.log(b[1] / a[1]));
  }
  return undefined;
}

/**
 * The inrush pulse against the SOA lines (common practice, docs/references.md "Inrush"): the
 * pulse P(t) as the rectangle of its energy at its peak power, width t = E/Ppeak, at the peak's
 * Vds and current. Each line is straight on log-log axes: the current at Vds is interpolated
 * log-log along a line (flat below its first point, nothing above its last: beyond the line's
 * voltage), then log-log between the two lines that bracket the width (the shortest line for a
 * shorter pulse: a shorter pulse is allowed at least as much). A pulse longer than the longest line
 * is not assessed. The lines hold at a 25 °C case; at a starting junction Tstart the allowed
 * current scales by (Tj,max − Tstart)/(Tj,max − 25 °C), the power derating of the same Zth
 * (none below 25 °C).
 */
export function soaCheck(
  lines: readonly SoaLine[],
  pulse: {
    readonly energyJ: number;
    readonly peakPowerW: number;
    readonly vdsAtPeakV: number;
    readonly currentAtPeakA: number;
  },
  tjMaxC: number,
  startTjC: number,
): SoaCheck {
  const sorted = [...lines].sort((a, b) => a.pulseWidthS - b.pulseWidthS);
  const widthS = pulse.peakPowerW > 0 ? pulse.energyJ / pulse.peakPowerW : 0;
  const longest = sorted.at(-1);
  if (longest === undefined) return { assessed: false, reason: "no SOA line given" };
  if (widthS > longest.pulseWidthS)
    return {
      assessed: false,
      reason: `the inrush's equivalent pulse (${widthS.toPrecision(3)} s) is longer than the longest SOA line (${longest.pulseWidthS} s)`,
    };
  const at = (l: SoaLine) =>
    logLog(
      l.points.map((p) => [p.vdsV, p.idA] as const),
      pulse.vdsAtPeakV,
    ) ?? 0;
  const derate = startTjC <= 25 ? 1 : tjMaxC > startTjC ? (tjMaxC - startTjC) / (tjMaxC - 25) : 0;
  const byWidth = sorted.map((l) => [l.pulseWidthS, Math.max(at(l), Number.MIN_VALUE)] as const);
  const line = logLog(byWidth, widthS) ?? 0;
  return {
    assessed: true,
    equivalentWidthS: widthS,
    vdsV: pulse.vdsAtPeakV,
    currentA: pulse.currentAtPeakA,
    allowedA: (line <= Number.MIN_VALUE * 2 ? 0 : line) * derate,
  };
}
