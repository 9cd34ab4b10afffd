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
      const atTj = c?.avalancheRatingAtTjJ;
      const after = c?.after ?? r.end;
      return {
        ...r,
        ...w,
        metrics: {
          blocksReverseCurrent: true,
          peakReverseCurrentA: r.peakReverseCurrentA,
          turnOffS: r.turnOffS,
          absorbedEnergyJ: absorbed,
          ...(rating === undefined ? {} : { avalancheRatingJ: rating }),
          ...(atTj === undefined
            ? {}
            : { avalancheRatingAtTjJ: atTj, ...(atTj > 0 ? { avalancheEnergyRatio: absorbed / atTj } : {}) }),
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
      return {
        ...r,
        ...w,
        metrics: {
          blocksReverseCurrent: true,
          peakReverseCurrentA: r.peakReverseCurrentA,
          outputVoltageLostV: r.end.voltageLostV,
        },
      };
  }
}
