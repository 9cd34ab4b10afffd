import { describe, expect, it } from "vitest";
import { turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { turnOffWaveform } from "../../../domain/checks/turn-off-waveform.js";
import { relativeError } from "../../helpers/tolerance.js";
import { pfetStage, schottkyStage, turnOffFixture } from "../../fixtures/reverse-stages.js";

const event = turnOffFixture;

/** Composite trapezoid ∫ f dt over samples [from, to]. */
function trapezoid(t: readonly number[], f: readonly number[], from = 0, to = t.length - 1): number {
  let s = 0;
  for (let k = from + 1; k <= to; k += 1) s += 0.5 * ((t[k] ?? 0) - (t[k - 1] ?? 0)) * ((f[k] ?? 0) + (f[k - 1] ?? 0));
  return s;
}

describe("turn-off waveform", () => {
  it("blocks with a clamp phase: the samples hold the reported peak, turn-off instant and clamp energy", () => {
    const r = turnOffEvent(event);
    const w = turnOffWaveform(event, r);
    if (r.outcome !== "blocks" || r.clamp === undefined || w === undefined) throw new Error(r.outcome);
    // Sampled from the same closed form: the reported peak is a sample, exactly.
    expect(Math.max(...w.currentA.map((i) => -i))).toBe(r.peakReverseCurrentA);
    const k = w.clampStartIndex ?? -1;
    expect(w.timeS[k]).toBe(r.turnOffS);
    expect(-(w.currentA[k] ?? 0)).toBeCloseTo(r.clamp.currentAtTurnOffA, 12);
    expect(w.timeS.at(-1)).toBeCloseTo(r.turnOffS + r.clamp.durationS, 15);
    // Source: the clamp phase ends where the loop current returns to zero (firstCrossing).
    expect(Math.abs(w.currentA.at(-1) ?? 1)).toBeLessThan(1e-9 * r.clamp.currentAtTurnOffA);
    for (let j = 1; j < w.timeS.length; j += 1) expect(w.timeS[j] ?? 0).toBeGreaterThan(w.timeS[j - 1] ?? 0);
    // Source: absorbedJ = Vcl·∫|i|dt over the clamp phase (exact integral); the trapezoid on 200
    // samples of the smooth closed form is within h²·max|i''|·T/12: stated bound 0.1 %.
    const absorbed = r.clamp.clampV * trapezoid(w.timeS, w.currentA.map(Math.abs), k);
    expect(relativeError(absorbed, r.clamp.absorbedJ)).toBeLessThan(1e-3);
    // Source: charge conservation at the output node (constant-current load I): C·(v0 − vC(t)) =
    // ∫(I − i)dt; compared with the reported charge lost by turn-off and by the end of the clamp.
    const lostBy = (to: number) =>
      trapezoid(
        w.timeS,
        w.currentA.map((i) => 2 - i),
        0,
        to,
      );
    expect(relativeError(lostBy(k), r.end.chargeLostC)).toBeLessThan(1e-3);
    expect(relativeError(lostBy(w.timeS.length - 1), r.clamp.after.chargeLostC)).toBeLessThan(1e-3);
    expect(w.capacitorV.at(-1)).toBeCloseTo(r.clamp.after.capacitorV, 12);
  });

  it("does not block: the window's end (the load minimum) and the peak are samples", () => {
    const m = { ...event, stage: pfetStage, load: { kind: "resistive" as const, resistanceOhm: 6 } };
    const r = turnOffEvent(m);
    const w = turnOffWaveform(m, r);
    if (r.outcome !== "does-not-block" || w === undefined) throw new Error(r.outcome);
    expect(w.clampStartIndex).toBeUndefined();
    expect(Math.max(...w.currentA.map((i) => -i))).toBe(r.peakReverseCurrentA);
    const end = w.timeS.indexOf(r.end.timeS);
    expect(end).toBeGreaterThanOrEqual(0);
    expect(w.outputV[end]).toBeCloseTo(9, 6);
    expect(w.timeS.at(-1)).toBe(Math.max(r.end.timeS, r.peakReverseTimeS));
    // Source: the reverse current's first extremum is a sample (extremaTimes of the closed form):
    // no sample beats the reported peak and the one at the peak time equals it.
    const at = w.timeS.indexOf(r.peakReverseTimeS);
    expect(at).toBeGreaterThanOrEqual(0);
  });

  it("diode with Qrr: reverse charge drawn by turn-off equals Qrr", () => {
    const qrr = 50e-9;
    const m = { ...event, stage: schottkyStage, reverseRecoveryChargeC: qrr };
    const r = turnOffEvent(m);
    const w = turnOffWaveform(m, r);
    if (r.outcome !== "blocks" || w === undefined) throw new Error(r.outcome);
    const zero = w.timeS.indexOf(r.detectS ?? -1);
    expect(zero).toBeGreaterThan(0);
    const end = w.clampStartIndex ?? w.timeS.length - 1;
    // Source: charge-control recovery (∫ −i dt from the zero crossing = Qrr); trapezoid over the
    // recovery samples, 0.5 % (fewer samples fall in the short recovery interval).
    expect(
      relativeError(
        trapezoid(
          w.timeS,
          w.currentA.map((i) => -i),
          zero,
          end,
        ),
        qrr,
      ),
    ).toBeLessThan(5e-3);
  });
});
