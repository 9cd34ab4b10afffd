import { describe, expect, it } from "vitest";
import { type TurnOffModel, type TurnOffOutcome, turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { turnOffWaveform } from "../../../domain/checks/turn-off-waveform.js";
import { loopSystem, stateAt } from "../../../domain/physics/rlc-series.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";
import { lowSideStage, pfetStage, turnOffFixture } from "../../fixtures/reverse-stages.js";

// An input that decays after the event (issue 19 item 11): from startV at t = 0+ to inputAfterV
// as e^(−t/τ), through the same closed form (rlc-series.ts). Outside references: the limits
// τ → 0 (the constant case at the final level) and τ → ∞ (the constant case at the start level),
// and ngspice on the same circuit with an EXP source.

const C = 470e-6;
const VTH = 2;
const pfet: TurnOffModel = {
  stage: pfetStage,
  outputV: 12,
  inputAfterV: -14,
  loopResistanceOhm: 0.045,
  loopInductanceH: 1e-9,
  capacitanceF: C,
  esrOhm: 0,
  load: { kind: "constant-current", currentA: 1 },
  loadMinV: 9,
  tjC: 25,
  gateLagS: (1e4 * 47e-9) / 10,
};

function gateOf(r: TurnOffOutcome) {
  if (r.outcome !== "does-not-block" || r.gateTurnOff === undefined) throw new Error(`no gate turn-off: ${r.outcome}`);
  return r.gateTurnOff;
}
const figures = (r: TurnOffOutcome) => {
  const g = gateOf(r);
  return { off: g.channelOffS, peak: g.peakReverseCurrentA, lost: g.chargeLostC, min: g.outputMinV };
};

describe("P-FET under an input decaying from 0 V to −14 V", () => {
  const decaying = (tauS: number): TurnOffModel => ({ ...pfet, inputDecay: { startV: 0, tauS } });
  it("τ → 0 (1 ps) equals the constant −14 V case; τ → ∞ (1e4 s) the constant 0 V case", () => {
    const fast = figures(turnOffEvent(decaying(1e-12)));
    const atFinal = figures(turnOffEvent(pfet));
    const slow = figures(turnOffEvent(decaying(1e4)));
    const atStart = figures(turnOffEvent({ ...pfet, inputAfterV: 0 }));
    for (const [a, b] of [
      [fast, atFinal],
      [slow, atStart],
    ] as const) {
      expect(relativeError(a.off, b.off)).toBeLessThan(1e-4);
      expect(relativeError(a.peak, b.peak)).toBeLessThan(1e-4);
      expect(relativeError(a.lost, b.lost)).toBeLessThan(1e-4);
      expect(Math.abs(a.min - b.min)).toBeLessThan(1e-3);
    }
    // between the two: a 20 us fall gives a smaller reverse peak than the step and a lower output than 0 V's
    const mid = figures(turnOffEvent(decaying(20e-6)));
    expect(mid.peak).toBeLessThan(atFinal.peak);
    expect(mid.peak).toBeGreaterThan(atStart.peak);
    expect(mid.min).toBeLessThan(atStart.min);
  });

  const hasSpice = toolAvailable("ngspice");
  // Source: ngspice on the same circuit as pfet-negative-input.test.ts, the input an EXP source
  // from 0 V to −14 V with τ = 20 us (its second edge far past the event).
  it.skipIf(!hasSpice)("τ = 20 us: turn-off time, output minimum and reverse peak within 1 % of ngspice", () => {
    const rows = runNgspice(`pfet decaying input
V1 in 0 EXP(0 -14 0 20u 1 1)
R1 in a 0.045
L1 a b 1n IC=1
S1 b out g 0 smod
D1 b out dbody
C1 out 0 ${C} IC=12
I1 out 0 DC 1
E1 e 0 out 0 1
Rg e g 10k
Cg g 0 4.7n IC=12
.model smod SW(VT=${VTH} VH=0 RON=0.005 ROFF=1e9)
.model dbody D(BV=60 IBV=1m N=1 RS=1m)
.tran 2n 80u UIC
.control
set wr_singlescale
run
wrdata out.txt v(out) v(g) l1#branch
quit
.endc
.end
`);
    const f = figures(turnOffEvent(decaying(20e-6)));
    const off = rows.find((row) => (row[2] ?? Number.POSITIVE_INFINITY) < VTH)?.[0] ?? Number.NaN;
    const minOut = Math.min(
      ...rows.filter((row) => (row[0] ?? 0) <= off + 1e-6).map((row) => row[1] ?? Number.POSITIVE_INFINITY),
    );
    const peak = Math.max(...rows.map((row) => -(row[3] ?? 0)));
    expect(relativeError(f.off, off)).toBeLessThan(0.01);
    expect(relativeError(f.min, minOut)).toBeLessThan(0.01);
    expect(relativeError(f.peak, peak)).toBeLessThan(0.01);
  });
});

describe("a controller stage (clamp phase) under a decaying input", () => {
  it("τ → 0 and τ → ∞ give the constant cases' turn-off, reverse peak, clamp energy and output minimum; energies balance", () => {
    const step0 = turnOffEvent({ ...turnOffFixture, inputAfterV: -5 });
    const fast = turnOffEvent({ ...turnOffFixture, inputAfterV: -5, inputDecay: { startV: 3, tauS: 1e-13 } });
    const slowAt = turnOffEvent({ ...turnOffFixture, inputAfterV: 3 });
    const slow = turnOffEvent({ ...turnOffFixture, inputAfterV: -5, inputDecay: { startV: 3, tauS: 1e4 } });
    for (const [a, b] of [
      [fast, step0],
      [slow, slowAt],
    ] as const) {
      if (a.outcome !== "blocks" || b.outcome !== "blocks") throw new Error(`${a.outcome} / ${b.outcome}`);
      expect(relativeError(a.turnOffS, b.turnOffS)).toBeLessThan(1e-4);
      expect(relativeError(a.peakReverseCurrentA, b.peakReverseCurrentA)).toBeLessThan(1e-4);
      expect(relativeError(a.clamp?.absorbedJ ?? 0, b.clamp?.absorbedJ ?? 1)).toBeLessThan(1e-3);
      expect(Math.abs(a.outputMinV - b.outputMinV)).toBeLessThan(1e-3);
      expect(Math.abs(a.energies.balanceResidual)).toBeLessThan(1e-6);
      expect(Math.abs(a.clamp?.energies.balanceResidual ?? 1)).toBeLessThan(1e-6);
    }
  });

  it("the waveform of a decaying input: continuous at the turn-off, its largest reverse current the event's", () => {
    const m: TurnOffModel = { ...turnOffFixture, inputAfterV: -5, inputDecay: { startV: 3, tauS: 2e-6 } };
    const r = turnOffEvent(m);
    const w = turnOffWaveform(m, r);
    if (r.outcome !== "blocks" || w === undefined || w.clampStartIndex === undefined) throw new Error(r.outcome);
    expect(Math.max(...w.currentA.map((i) => -i))).toBeCloseTo(r.peakReverseCurrentA, 9);
    // the clamp phase ends where the event's clamp phase says the current stopped
    expect(Math.abs(w.currentA[w.currentA.length - 1] ?? 1)).toBeLessThan(1e-6 * r.peakReverseCurrentA);
    expect(w.timeS[w.timeS.length - 1]).toBeCloseTo(r.turnOffS + (r.clamp?.durationS ?? 0), 12);
  });
});

describe("a low-side N-FET, whose gate the output drives", () => {
  // Circuit reasoning (its reverse path, domain/stages/nfet-low-side.ts; ngspice in
  // test/domain/review/pulse-back-conduction-low-side.test.ts): its Vgs is the output's, so a step
  // to 0 V and a decay from 10 V to 0 V both conduct backwards until the output crosses threshold,
  // the decay later (it holds the output up longer).
  it("an input stepping to 0 V and one decaying from 10 V to 0 V both turn the channel off at threshold, the decay later", () => {
    const step = turnOffEvent({ ...turnOffFixture, stage: lowSideStage });
    const decaying = turnOffEvent({
      ...turnOffFixture,
      stage: lowSideStage,
      inputDecay: { startV: 10, tauS: 50e-6 },
    });
    if (step.outcome !== "does-not-block" || decaying.outcome !== "does-not-block") throw new Error("blocks");
    expect(step.gateTurnOff?.channelOffS).toBeGreaterThan(0);
    expect(decaying.gateTurnOff?.channelOffS).toBeGreaterThan(step.gateTurnOff?.channelOffS ?? Infinity);
  });
});

describe("a slow fall under a ringing loop", () => {
  // Source: a dense scan (20,000 points) of the closed form itself: the reported reverse peak and
  // output minimum are the scan's, also where later swings exceed the first ones.
  it.each([5e-6, 30e-6, 200e-6, 2e-3])("τ = %s s: the reverse peak and output minimum are the dense scan's", (tauS) => {
    const m: TurnOffModel = {
      ...pfet,
      gateLagS: 0,
      loopResistanceOhm: 0.002,
      loopInductanceH: 2e-6,
      capacitanceF: 47e-6,
      inputAfterV: -30,
      inputDecay: { startV: 8, tauS },
    };
    const r = turnOffEvent(m);
    if (r.outcome !== "does-not-block") throw new Error(r.outcome);
    const end = r.gateTurnOff?.channelOffS ?? r.end.timeS;
    const loop = {
      sourceV: m.inputAfterV,
      sourceDecay: { extraV: 8 - m.inputAfterV, tauS },
      loopResistanceOhm: r.loop.totalResistanceOhm,
      inductanceH: m.loopInductanceH,
      capacitanceF: m.capacitanceF,
      esrOhm: 0,
      loadCurrentA: 1,
      loadConductanceS: 0,
    };
    const s = loopSystem(loop);
    let peak = 0;
    let low = Number.POSITIVE_INFINITY;
    for (let k = 0; k <= 20_000; k += 1) {
      const x = stateAt(s, [1, 12], (k * end) / 20_000);
      peak = Math.max(peak, -x[0]);
      low = Math.min(low, x[1]);
    }
    const g = r.gateTurnOff;
    expect(g?.peakReverseCurrentA ?? r.peakReverseCurrentA).toBeGreaterThanOrEqual(peak * (1 - 1e-9));
    expect(relativeError(g?.peakReverseCurrentA ?? r.peakReverseCurrentA, peak)).toBeLessThan(1e-4);
    expect(g?.outputMinV ?? r.outputMinV).toBeLessThanOrEqual(low + 1e-6);
  });
});
