import type { TurnOffEventOutput } from "../../contracts/turn-off.js";
import type { TurnOffOutcome } from "../../domain/checks/turn-off-event.js";
import type { TurnOffWaveform } from "../../domain/checks/turn-off-waveform.js";

/** The event's result fields with its rule metrics (and the waveform when sampled); no provenance. */
export function turnOffEventFields(r: TurnOffOutcome, v0: number, waveform?: TurnOffWaveform): TurnOffEventOutput {
  const w = waveform === undefined ? {} : { waveform };
  switch (r.outcome) {
    case "clamp-below-drive":
    case "invalid-load-line":
    case "unstable-loop":
      return { ...r };
    case "blocks": {
      const c = r.clamp;
      const absorbed = c?.absorbedJ ?? 0;
      const rating = c?.avalancheRatingJ;
      const after = c?.after ?? r.end;
      return {
        ...r,
        ...w,
        metrics: {
          blocksReverseCurrent: true,
          peakReverseCurrentA: r.peakReverseCurrentA,
          turnOffS: r.turnOffS,
          absorbedEnergyJ: absorbed,
          ...(rating === undefined ? {} : { avalancheRatingJ: rating, avalancheEnergyRatio: absorbed / rating }),
          outputVoltageLostV: v0 - after.capacitorV,
        },
      };
    }
    case "does-not-block":
      return {
        ...r,
        ...w,
        metrics: {
          blocksReverseCurrent: false,
          peakReverseCurrentA: r.peakReverseCurrentA,
          outputVoltageLostV: r.end.voltageLostV,
          ...(r.fallsBelowMinS === undefined ? {} : { fallsBelowLoadMinimumS: r.fallsBelowMinS }),
        },
      };
    case "stays-on":
      return { ...r, ...w, metrics: { blocksReverseCurrent: true, peakReverseCurrentA: r.peakReverseCurrentA, outputVoltageLostV: r.end.voltageLostV } };
  }
}

/**
 * The event's reverse peak as a rule metric: the value where it is the event's maximum; where it
 * is only a lower bound (the current still rising at the end of the searched span) it is
 * unavailable with the bound in the reason, so that no rule passes on it.
 */
export function putPeakReverse(r: { readonly peakReverseCurrentA: number; readonly peakReverseIsLowerBound?: true }, metrics: Record<string, number | boolean>, unavailable: Record<string, string>): void {
  if (r.peakReverseIsLowerBound === true) unavailable["peakReverseCurrentA"] = `the reverse current is still rising at the end of the simulated span: ${r.peakReverseCurrentA.toPrecision(4)} A is only a lower bound of its peak`;
  else metrics["peakReverseCurrentA"] = r.peakReverseCurrentA;
}
