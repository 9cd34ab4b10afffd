import { describe, expect, it } from "vitest";
import { type TurnOffModel, turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { assessed, eventOf, pulse1, TAU, tvs } from "../../fixtures/pulse-1-clamp.js";
import { pfetStage } from "../../fixtures/reverse-stages.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";

// A negative pulse whose peak the design's input clamp limits (issue 19 item 11): the clamp holds the
// input node at its level while the generator is beyond it, and lets go where the generator alone
// carries the loop current, Vth(t) − Ri·i(t) = Vcl (turn-off-input-clamp.ts); the input then follows
// the generator behind Ri, the loop's state carried across. Outside references: ngspice on the same
// circuit, the closed form of the release with no loop current, t = τ·ln(A/(Vcl + Ri·i0 − Vf)), and
// the limit of a clamp beyond the pulse's peak (no hold: the unclamped event, exactly).

describe("a negative pulse held at the input clamp's level, then following the generator", () => {
  const hasSpice = toolAvailable("ngspice");
  // Source: ngspice on the same circuit: the generator an EXP source from −150 V back to 0 (τ = 0.869 ms)
  // behind 10 ohm; the clamp a near-ideal diode (N = 0.02) from −28.9 V behind 0.185 ohm; the P-FET a
  // switch on v(g) > 2 V (RON = the channel's 5 mOhm) with its body diode (BV 60 V), the gate an R-C
  // copy of the output (Rg·Cg = the gate lag); 1 A load. The netlist style of the P-FET pulse tests.
  const cases = [
    { inductanceH: 22e-6, gateLagS: 1e-3, capacitanceF: 470e-6 },
    { inductanceH: 22e-6, gateLagS: 1e-4, capacitanceF: 100e-6 },
    { inductanceH: 1e-6, gateLagS: 1e-3, capacitanceF: 470e-6 },
  ];
  it.skipIf(!hasSpice).each(cases)(
    "L $inductanceH H, gate lag $gateLagS s, $capacitanceF F: reverse peak, charge lost, output minimum and the clamp's release within 1 % of ngspice",
    ({ inductanceH, gateLagS, capacitanceF }) => {
      const p = assessed(eventOf(inductanceH, gateLagS, capacitanceF), pulse1, tvs);
      const offS = p.channelOffS ?? Number.NaN;
      const rows = runNgspice(`pfet pulse 1 clamp hold
Vg gen 0 EXP(-150 0 0 ${TAU} 1 1)
Ri gen in 10
Vk k 0 DC -28.9
Rk k k2 0.185
Dk k2 in dclamp
L1 in b ${inductanceH} IC=1
S1 b out g 0 smod
D1 b out dbody
C1 out 0 ${capacitanceF} IC=12
I1 out 0 DC 1
E1 e 0 out 0 1
Rg e g 100k
Cg g 0 ${gateLagS / 1e5} IC=12
.model smod SW(VT=2 VH=0 RON=0.005 ROFF=1e9)
.model dbody D(BV=60 IBV=1m N=1 RS=1m)
.model dclamp D(IS=1e-14 N=0.02)
.tran 20n ${1.5 * offS} UIC
.control
set wr_singlescale
run
wrdata out.txt v(out) v(g) l1#branch v(in)
quit
.endc
.end
`);
      const t = (r: number[]) => r[0] ?? 0;
      const peakA = Math.max(...rows.map((r) => -(r[3] ?? 0)));
      const off = rows.find((r) => (r[2] ?? Number.POSITIVE_INFINITY) < 2);
      // The loop current has stopped once it is back within 1e-6 of its peak (the diodes' leakage).
      const stop = rows.find((r) => t(r) > t(off ?? []) && (r[3] ?? -1) > -1e-6 * peakA) ?? [];
      const window = rows.filter((r) => t(r) <= t(stop));
      const minV = Math.min(...window.map((r) => r[1] ?? Number.POSITIVE_INFINITY));
      const chargeC = capacitanceF * (12 - (stop[1] ?? Number.NaN));
      const release = rows.find((r) => (r[4] ?? Number.NEGATIVE_INFINITY) > -28.9);
      expect(relativeError(p.peakReverseCurrentA, peakA)).toBeLessThan(0.01);
      expect(relativeError(p.chargeLostC, chargeC)).toBeLessThan(0.01);
      expect(relativeError(p.outputMinV, minV)).toBeLessThan(0.01);
      expect(relativeError(offS, t(off ?? []))).toBeLessThan(0.01);
      // The release within 2 % or two of ngspice's 20 ns output steps (it lies at 0.3-7 us).
      expect(Math.abs((p.clampHold?.releaseS ?? Number.NaN) - t(release ?? []))).toBeLessThan(
        0.02 * t(release ?? []) + 40e-9,
      );
    },
  );

  it("the clamp beyond the pulse's peak never conducts: no hold, the figures of the unclamped event exactly", () => {
    const t = eventOf(1e-6, 1e-3, 470e-6);
    const high = { ...tvs, breakdownV: 200, clampV: 220 };
    const held = assessed(t, pulse1, high);
    const free = assessed(t, pulse1, undefined);
    expect(held.clampHold).toBeUndefined();
    expect(held).toEqual(free);
  });

  it("with no loop current to speak of (10 kH of loop), it lets go at τ·ln(A/(Vcl + Ri·i0 − Vf)), whatever its dynamic resistance", () => {
    // Closed form: the generator Vf + A·e^(−t/τ) behind Ri carries the loop's i0 alone where Vth − Ri·i0 = Vcl.
    const i0 = 1;
    const expected = TAU * Math.log(150 / (28.9 - 10 * i0));
    const model = (dynamicOhm: number): TurnOffModel => ({
      stage: pfetStage,
      outputV: 12,
      inputAfterV: 0,
      inputDecay: { startV: -150, tauS: TAU },
      inputClamp: { levelV: -28.9, dynamicOhm },
      loopResistanceOhm: 10,
      loopInductanceH: 1e4,
      capacitanceF: 1,
      esrOhm: 0,
      load: { kind: "constant-current", currentA: i0 },
      loadMinV: -1e3,
      tjC: 25,
    });
    for (const rd of [0, 0.185, 2]) {
      const r = turnOffEvent(model(rd));
      if (r.outcome === "clamp-below-drive" || r.outcome === "invalid-load-line" || r.outcome === "unstable-loop")
        throw new Error(r.outcome);
      expect(relativeError(r.inputClampHold?.releaseS ?? Number.NaN, expected)).toBeLessThan(1e-4);
      // Held: the node at the clamp's level less rd times its current, the generator's beyond it plus the loop's (KCL).
      const jA = (150 - 28.9 + 10 * i0) / (10 + rd);
      expect(r.inputClampHold?.inputAtStartV).toBeCloseTo(-28.9 - rd * jA, 9);
    }
  });

  it("is harsher than the clamp level decaying from t = 0 (the model before): the gap it closes", () => {
    // The earlier input: the clamp's level at 0+ decaying with the pulse's τ from there.
    const t = eventOf(1e-6, 1e-3, 470e-6);
    const held = assessed(t, pulse1, tvs);
    const before = assessed(t, { ...pulse1, amplitudeV: -31.0997 }, undefined);
    expect(held.peakReverseCurrentA).toBeGreaterThan(3 * before.peakReverseCurrentA);
    expect(held.outputMinV).toBeLessThan(-9.5);
    expect(before.outputMinV).toBeGreaterThan(-1.5);
    expect(held.chargeLostC).toBeGreaterThan(1.5 * before.chargeLostC);
  });
});
