import { TYPICAL } from "../helpers/stages.js";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { reviewOutput } from "../../contracts/review.js";
import { turnOffOutput } from "../../contracts/turn-off.js";
import { demoContext } from "../helpers/app.js";

const ctx = demoContext();
const review = procedureInvoker(ctx)("review");
const turnOff = procedureInvoker(ctx)("turnOff");
const example = JSON.parse(readFileSync(join(projectRoot(), "examples/requests/review.json"), "utf8")).input;
const pfet = { kind: "catalog-part", partId: "demo-pfet-40v-12mohm" };
const PULSE_1 = "iso7637-2-pulse-1-12v";

async function reviewPfet(turnOffSection: object, extra: object = {}) {
  if (review === undefined) throw new Error("review missing");
  const requirement = { ...example.requirement, ...extra, transients: [PULSE_1, "iso7637-2-pulse-3a-12v"] };
  const r = reviewOutput.parse(
    await review({
      requirement: { ...requirement, turnOff: turnOffSection },
      candidates: [{ stage: pfet, datasheetMax: TYPICAL }],
    }),
  );
  const c = r.candidates[0];
  const p = c?.pulseBackConduction?.find((x) => x.pulseId === PULSE_1);
  if (c === undefined || p?.outcome !== "assessed") throw new Error(`pulse 1 not assessed: ${JSON.stringify(p)}`);
  return { r, c, p };
}

describe("the review's negative pulses through a P-FET candidate's back-conducting channel", () => {
  it("pulse 1 at a P-FET equals the turnOff procedure (ngspice-checked model) run on the same decaying negative input", async () => {
    if (turnOff === undefined) throw new Error("turnOff missing");
    const gateLag = { resistanceOhm: "10 kOhm", gateChargeC: "30 nC", atGateSourceV: "10 V" };
    const { r, c, p } = await reviewPfet({ ...example.requirement.turnOff, gateLag });
    // The pulse's input: the generator unclamped (−150 V, the transient check's τ) behind Ri, held by the
    // design's clamp (VBR 28.9 V, 40 V at 60 A: rd = 0.185 ohm) at its level while the generator is beyond it.
    const t = (c.transients as { pulseId: string; inputPeakV: number; tauS: number }[]).find(
      (x) => x.pulseId === PULSE_1,
    );
    const clamp = example.requirement.inputClamp;
    const rd = (clamp.clampV - clamp.breakdownV) / clamp.peakCurrentA;
    expect(p.clampHold?.levelV).toBe(-clamp.breakdownV);
    expect(p.clampHold?.dynamicOhm).toBeCloseTo(rd, 15);
    // At 0+ the clamp carries the generator's current beyond it and the load's: within 1 % of the transient
    // check's clamp voltage at its peak current (the generator's alone).
    expect(Math.abs(p.inputPeakV / (t?.inputPeakV ?? 0) - 1)).toBeLessThan(0.02);
    expect(p.tauS).toBe(t?.tauS);
    expect(p.inputAfterV).toBe(0);
    expect(p.loopResistanceOhm).toBe(10); // pulse 1's Ri, 12 V system
    const direct = turnOffOutput.parse(
      await turnOff({
        stage: pfet,
        outputV: r.requirement.supplyNominalV,
        inputAfterV: 0,
        inputDecay: {
          startV: -150,
          timeConstantS: p.tauS,
          clamp: { levelV: -clamp.breakdownV, dynamicResistanceOhm: rd },
        },
        gateLag,
        loop: { ...example.requirement.turnOff.loop, resistanceOhm: 10 },
        capacitor: example.requirement.turnOff.capacitor,
        load: example.requirement.load,
        loadMinV: example.requirement.loadMinV,
        tjC: c.turnOff?.tjC ?? 0,
      }),
    );
    if (direct.outcome !== "does-not-block" || direct.gateTurnOff === undefined) throw new Error(direct.outcome);
    expect(p.peakReverseCurrentA).toBe(direct.gateTurnOff.peakReverseCurrentA);
    expect(p.chargeLostC).toBe(direct.gateTurnOff.chargeLostC);
    expect(p.outputMinV).toBe(direct.outputMinV);
    expect(p.channelOffS).toBe(direct.gateTurnOff.channelOffS);
    // The pulse's figures reach the rules: the largest of the turn-off event and the pulse.
    const ev = c.turnOff?.event;
    if (ev?.outcome !== "does-not-block") throw new Error("no drain-back event");
    expect(c.metrics["peakReverseCurrentA"]).toBe(
      Math.max(ev.gateTurnOff?.peakReverseCurrentA ?? ev.peakReverseCurrentA, p.peakReverseCurrentA),
    );
    expect(c.metrics["loadReverseVMaxV"]).toBe(Math.max(0, -ev.outputMinV, -p.outputMinV));
    expect(r.assumptions.some((a) => a.includes("ISO 7637-2 pulse 1") && a.includes("generator's Ri"))).toBe(true);
  });

  it("pulse 3a riding on the supply: the battery and the generator as one Thevenin source; the battery holds the output", async () => {
    // Source: Thevenin's theorem (two-source-thevenin.ts, checked against ngspice on the two-source
    // circuit): Vth(0+) = Vb + A·Rb/(Ri + Rb), Rth = Ri·Rb/(Ri + Rb), with Rb the requirement's
    // sourceResistanceOhm (30 mOhm in the example) and Ri = 50 ohm, A = −220 V (ISO 7637-2:2011 pulse 3a, 12 V, level IV;
    // docs/references.md).
    const { r, c } = await reviewPfet(example.requirement.turnOff);
    const p = c.pulseBackConduction?.find((x) => x.pulseId === "iso7637-2-pulse-3a-12v");
    if (p?.outcome !== "assessed") throw new Error(`pulse 3a not assessed: ${JSON.stringify(p)}`);
    const vb = r.requirement.supplyNominalV;
    const rb = 0.03;
    expect(p.batteryResistanceOhm).toBeCloseTo(rb, 12);
    expect(p.loopResistanceOhm).toBeCloseTo((50 * rb) / (50 + rb), 12);
    expect(p.inputAfterV).toBeCloseTo(vb, 9);
    expect(p.inputPeakV).toBeCloseTo(vb - (220 * rb) / (50 + rb), 9);
    // The battery holds the output: |Vgs| never falls below threshold, the channel conducts throughout.
    expect(p.channel).toBe("conducts-throughout");
    expect(p.channelOffS).toBeUndefined();
    expect(p.outputMinV).toBeGreaterThan(vb - 1);
    // Its figures reach the rules with the event's and pulse 1's: the largest of them.
    const p1 = c.pulseBackConduction?.find((x) => x.pulseId === PULSE_1);
    const ev = c.turnOff?.event;
    if (p1?.outcome !== "assessed" || ev?.outcome !== "does-not-block") throw new Error("no pulse 1 or event");
    expect(c.metrics["peakReverseCurrentA"]).toBe(
      Math.max(
        ev.gateTurnOff?.peakReverseCurrentA ?? ev.peakReverseCurrentA,
        p1.peakReverseCurrentA,
        p.peakReverseCurrentA,
      ),
    );
    expect(r.assumptions.some((a) => a.includes("pulse 3a") && a.includes("Thevenin"))).toBe(true);
  });

  it("a large output capacitor: the peak and the channel's turn-off follow the R-C closed form under the decaying input", async () => {
    // Source: first-order R-C loop driven by Vin(t) = Vp·e^(−t/τ): with T = R·C and a load current I,
    // v(t) = −I·R + B·e^(−t/τ) + (V0 + I·R − B)·e^(−t/T), B = Vp·τ/(τ − T); the reverse peak at
    // t → 0+ (L/R = 0.1 us ≪ τ) is (V0 − Vp)/R less the load current (closed form).
    if (turnOff === undefined) throw new Error("turnOff missing");
    const loadA = 0.001;
    const { r, c, p } = await reviewPfet(
      {
        ...example.requirement.turnOff,
        capacitor: { capacitanceF: "100 mF", esrOhm: "1 mOhm" },
      },
      { load: { kind: "constant-current", currentA: loadA } },
    );
    const v0 = r.requirement.supplyNominalV;
    // The reverse current out of 100 mF takes the generator's whole current at once: the clamp lets go
    // within a microsecond, and the input is the generator's, Vp = −150 V behind Ri, from then on.
    expect(p.clampHold?.releaseS).toBeLessThan(1e-6);
    const vp = -150;
    const direct = turnOffOutput.parse(
      await turnOff({
        stage: pfet,
        outputV: v0,
        inputAfterV: 0,
        inputDecay: { startV: vp, timeConstantS: p.tauS },
        loop: { ...example.requirement.turnOff.loop, resistanceOhm: 10 },
        capacitor: { capacitanceF: "100 mF", esrOhm: "1 mOhm" },
        load: { kind: "constant-current", currentA: loadA },
        loadMinV: example.requirement.loadMinV,
        tjC: c.turnOff?.tjC ?? 0,
      }),
    );
    if (
      direct.outcome === "clamp-below-drive" ||
      direct.outcome === "invalid-load-line" ||
      direct.outcome === "unstable-loop"
    )
      throw new Error(direct.outcome);
    const rOhm = direct.loop.totalResistanceOhm + 1e-3; // loop, channel and the capacitor's ESR
    expect(p.peakReverseCurrentA / ((v0 - vp) / rOhm - loadA) - 1).toBeLessThan(2e-3);
    expect(p.peakReverseCurrentA / ((v0 - vp) / rOhm - loadA) - 1).toBeGreaterThan(-2e-3);
    const tau = p.tauS;
    const T = rOhm * 0.1;
    const b = (vp * tau) / (tau - T);
    const tOff = p.channelOffS ?? Number.NaN;
    const vAtOff = -loadA * rOhm + b * Math.exp(-tOff / tau) + (v0 + loadA * rOhm - b) * Math.exp(-tOff / T);
    // The gate follows the output at once (no gate lag given): the channel lets go at the output's lowest point.
    expect(vAtOff).toBeCloseTo(p.outputMinV, 2);
    // Charge conservation on the capacitor: C·(V0 − Vmin) less the load's share over the event.
    expect(p.chargeLostC / (0.1 * (v0 - p.outputMinV))).toBeCloseTo(1, 2);
  });
});

describe("the review's negative pulses through a low-side N-FET candidate", () => {
  // Its Vgs is the positive rail against its source at the module's ground: the output's, as a
  // P-FET's |Vgs| is (ngspice: test/domain/review/pulse-back-conduction-low-side.test.ts).
  const lowSide = { kind: "catalog-part", partId: "demo-nfet-low-side-60v-4mohm" };
  it("pulse 1 equals the turnOff procedure on the same decaying input; the body diode's stress adds the output at the let-go", async () => {
    if (review === undefined || turnOff === undefined) throw new Error("procedures missing");
    const gateLag = { resistanceOhm: "1 kOhm", gateChargeC: "30 nC", atGateSourceV: "10 V" };
    const turnOffSection = { ...example.requirement.turnOff, gateLag };
    const r = reviewOutput.parse(
      await review({
        requirement: { ...example.requirement, transients: [PULSE_1], turnOff: turnOffSection },
        candidates: [{ stage: lowSide }],
      }),
    );
    const c = r.candidates[0];
    const p = c?.pulseBackConduction?.find((x) => x.pulseId === PULSE_1);
    if (c === undefined || p?.outcome !== "assessed") throw new Error(`pulse 1 not assessed: ${JSON.stringify(p)}`);
    const direct = turnOffOutput.parse(
      await turnOff({
        stage: lowSide,
        outputV: r.requirement.supplyNominalV,
        inputAfterV: 0,
        inputDecay: {
          startV: -150, // the generator unclamped, as at the P-FET above
          timeConstantS: p.tauS,
          // the design's clamp holds the input
          ...(p.clampHold === undefined
            ? {}
            : { clamp: { levelV: p.clampHold.levelV, dynamicResistanceOhm: p.clampHold.dynamicOhm } }),
        },
        gateLag,
        loop: { ...example.requirement.turnOff.loop, resistanceOhm: 10 },
        capacitor: example.requirement.turnOff.capacitor,
        load: example.requirement.load,
        loadMinV: example.requirement.loadMinV,
        tjC: c.turnOff?.tjC ?? 0,
      }),
    );
    if (direct.outcome !== "does-not-block" || direct.gateTurnOff === undefined) throw new Error(direct.outcome);
    expect(p.channel).toBe("turned-off");
    expect(p.peakReverseCurrentA).toBe(direct.gateTurnOff.peakReverseCurrentA);
    expect(p.chargeLostC).toBe(direct.gateTurnOff.chargeLostC);
    expect(p.outputMinV).toBe(direct.outputMinV);
    expect(p.outputAtLetGoV).toBe(direct.gateTurnOff.end.outputV);
    expect(p.outputAtLetGoV).toBeGreaterThan(0);
    const t = (c.transients as { pulseId: string; inputPeakV: number; stresses: { seenV: number }[] }[]).find(
      (x) => x.pulseId === PULSE_1,
    );
    expect(t?.stresses[0]?.seenV).toBe(-(t?.inputPeakV ?? 0) + Math.max(p.outputAtLetGoV ?? 0, 0));
    expect(c.metrics["loadReverseVMaxV"]).toBeGreaterThanOrEqual(Math.max(0, -p.outputMinV));
    expect(r.assumptions.some((a) => a.includes("low-side N-FET candidate"))).toBe(true);
  });
});
