import type { LoadOvervoltage } from "../../domain/checks/load-overvoltage.js";
import type { ReviewInrushResult } from "../../domain/review/review-inrush.js";
import { type Candidate, num } from "./format.js";

/** The candidate's start-up charge of the output capacitance and what reached its load, in words (renders the result, computes nothing). */
export function inrushLines(c: Candidate): string[] {
  const lines: string[] = [];
  const i = c.inrush as ReviewInrushResult | undefined;
  if (i !== undefined) {
    if (!i.assessed) lines.push(`inrush: not assessed (${i.reason})`);
    else {
      const r = i.result;
      const tj =
        r.tjPeakC === undefined ? "Tj not assessed (no transient thermal network)" : `Tj up to ${num(r.tjPeakC)} °C`;
      const body =
        r.outcome === "does-not-charge"
          ? r.reason
          : `charge ${num(r.chargeTimeS)} s, peak ${num(r.peakCurrentA)} A and ${num(r.peakPowerW)} W, ${num(r.energyJ)} J in the stage, ${tj}${r.outcome === "thermal-shutdown" ? `: ${r.reason}` : ""}`;
      const soa = i.soa?.assessed
        ? `; SOA ${num(i.soa.currentA)} A at ${num(i.soa.vdsV)} V for ${num(i.soa.equivalentWidthS)} s against ${num(i.soa.allowedA)} A`
        : "";
      const pair =
        i.pairDissipation === undefined
          ? ""
          : i.pairDissipation === "input-side-fet"
            ? "; the whole drop on the pair's input-side FET"
            : "; each of the pair's channels half the drop";
      lines.push(`inrush (${i.drive}): ${r.outcome}: ${body}${soa}; input ${num(i.inputV)} V${pair}`);
    }
  }
  const lo = c.loadOvervoltage as LoadOvervoltage | undefined;
  if (lo?.cutoff !== undefined)
    lines.push(
      `overvoltage cut-off at ${num(lo.cutoff.thresholdV)} V in ${num(lo.cutoff.responseS)} s: the load sees at most ${num(lo.loadVMaxV)} V`,
    );
  return lines;
}
