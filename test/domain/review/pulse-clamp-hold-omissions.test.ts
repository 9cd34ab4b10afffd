import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { clampLawOf } from "../../../domain/checks/transient-clamp.js";
import { transientStress } from "../../../domain/checks/transient-stress.js";
import { type TurnOffModel, turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { loopSystem, stateAt } from "../../../domain/physics/rlc-series.js";
import { pulseBackConduction } from "../../../domain/review/review-pulse-back-conduction.js";
import { ctx, eventOf, pulse1, req, TAU, tvs } from "../../fixtures/pulse-1-clamp.js";
import { pfetStage } from "../../fixtures/reverse-stages.js";

// What the pulse back-conduction model leaves out, each shown on the conservative side
// (review-pulse-back-conduction.ts), and its figures' finiteness over random inputs.

describe("the clamp-hold model's omissions and bounds", () => {
  it("left out on the conservative side: the I·R offset before the event (the output starting at its nominal level)", () => {
    // The true pre-event output is lower by I·(R + Rds), 3 A × 50 mOhm here: each figure from the
    // nominal start is at least as severe (more reverse current, more charge lost, no higher minimum).
    for (const [inductanceH, gateLagS, capacitanceF] of [
      [1e-6, 1e-3, 470e-6],
      [22e-6, 1e-4, 100e-6],
      [1e-6, 3e-4, 47e-6],
      [1e-6, 1e-6, 470e-6],
    ] as const) {
      const run = (outputV: number) => {
        const r = pulseBackConduction(
          { ...eventOf(inductanceH, gateLagS, capacitanceF), outputV },
          { ...req, load: { kind: "constant-current", currentA: 3 } },
          pfetStage,
          25,
          { nominalV: 12, resistanceOhm: 0 },
          [pulse1],
          [transientStress(pfetStage, pulse1, ctx)],
          clampLawOf(tvs),
        )[0];
        if (r?.outcome !== "assessed") throw new Error(JSON.stringify(r));
        return r;
      };
      const nominal = run(12);
      const offset = run(12 - 3 * 0.05);
      expect(nominal.peakReverseCurrentA).toBeGreaterThanOrEqual(offset.peakReverseCurrentA);
      expect(nominal.chargeLostC).toBeGreaterThanOrEqual(offset.chargeLostC);
      expect(nominal.outputMinV).toBeLessThanOrEqual(offset.outputMinV);
    }
  });

  it("left out on the conservative side: the body diode's forward drop (reverse-biased while reverse current flows)", () => {
    // While the channel carries reverse current its drop i·Rds puts the output above the diode's
    // anode: the diode is reverse-biased over the whole window up to the turn-off, then in avalanche in
    // the clamp phase, so it never conducts forward before the loop current stops (the ngspice
    // circuits above include it and agree within 1 %). Over the window the loop current is reverse or
    // zero: no forward current, which alone could bring the diode in (and would only raise the output).
    const t = eventOf(1e-6, 1e-3, 470e-6);
    const m: TurnOffModel = {
      stage: pfetStage,
      outputV: 12,
      inputAfterV: 0,
      inputDecay: { startV: -150, tauS: TAU },
      inputClamp: { levelV: -28.9, dynamicOhm: 0.185 },
      loopResistanceOhm: 10,
      loopInductanceH: t.loopInductanceH,
      capacitanceF: t.capacitanceF,
      esrOhm: 0,
      load: { kind: "constant-current", currentA: 1 },
      loadMinV: -1e3,
      tjC: 25,
      gateLagS: t.gateLagS ?? 0,
    };
    const r = turnOffEvent(m);
    if (r.outcome !== "does-not-block" || r.gateTurnOff === undefined) throw new Error(r.outcome);
    const offS = r.gateTurnOff.channelOffS;
    const s = loopSystem({
      sourceV: 0,
      sourceDecay: { extraV: -150, tauS: TAU },
      loopResistanceOhm: r.loop.totalResistanceOhm,
      inductanceH: m.loopInductanceH,
      capacitanceF: m.capacitanceF,
      esrOhm: 0,
      loadCurrentA: 1,
      loadConductanceS: 0,
      ...(r.inputClampHold?.releaseS === undefined
        ? {}
        : {
            hold: {
              untilS: r.inputClampHold.releaseS,
              sourceV: -28.9 * (10 / 10.185),
              extraV: -150 * (0.185 / 10.185),
              loopResistanceOhm: (10 * 0.185) / 10.185 + r.loop.stageResistanceOhm,
            },
          }),
    });
    // The loop current once it has reversed (after the load's 1 A at t = 0 turns within a fraction of a microsecond).
    for (let k = 1; k <= 1000; k += 1) {
      const time = (k / 1000) * offS;
      if (time > 1e-6) expect(stateAt(s, [1, 12], time)[0]).toBeLessThan(0);
    }
  });

  it("every figure is finite over 100 random pulses, clamps and loops (no NaN or Infinity leaves the model)", () => {
    const finite = (x: unknown): boolean =>
      typeof x === "number"
        ? Number.isFinite(x)
        : typeof x === "object" && x !== null
          ? Object.values(x).every(finite)
          : true;
    fc.assert(
      fc.property(
        fc.record({
          amplitudeV: fc.double({ min: -600, max: -20, noNaN: true }),
          riOhm: fc.double({ min: 0.5, max: 50, noNaN: true }),
          decayS: fc.double({ min: 1e-5, max: 1e-2, noNaN: true }),
          breakdownV: fc.double({ min: 15, max: 200, noNaN: true }),
          rdOhm: fc.double({ min: 0, max: 2, noNaN: true }),
          inductanceH: fc.double({ min: 1e-7, max: 1e-4, noNaN: true }),
          capacitanceF: fc.double({ min: 1e-6, max: 1e-2, noNaN: true }),
          gateLagS: fc.double({ min: 0, max: 3e-3, noNaN: true }),
        }),
        (k) => {
          const pulse = { ...pulse1, amplitudeV: k.amplitudeV, sourceResistanceOhm: k.riOhm, decayS: k.decayS };
          const clamp = { ...tvs, breakdownV: k.breakdownV, clampV: k.breakdownV + 60 * k.rdOhm };
          const r = pulseBackConduction(
            eventOf(k.inductanceH, k.gateLagS, k.capacitanceF),
            req,
            pfetStage,
            25,
            { nominalV: 12, resistanceOhm: 0 },
            [pulse],
            [transientStress(pfetStage, pulse, { ...ctx, inputClamp: clamp })],
            clampLawOf(clamp),
          )[0];
          expect(r).toBeDefined();
          expect(finite(r)).toBe(true);
          if (r?.outcome === "assessed" && r.clampHold?.releaseS !== undefined)
            expect(r.clampHold.releaseS).toBeGreaterThanOrEqual(0);
        },
      ),
      { numRuns: 100, seed: 19 },
    );
  });
});
