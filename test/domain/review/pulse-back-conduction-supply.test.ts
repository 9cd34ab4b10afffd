import { describe, expect, it } from "vitest";
import { transientStress } from "../../../domain/checks/transient-stress.js";
import { pulseBackConduction } from "../../../domain/review/review-pulse-back-conduction.js";
import type { ReviewTurnOff } from "../../../domain/review/review-turn-off.js";
import type { TransientPulse } from "../../../domain/review/transient-library.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";
import { pfetStage } from "../../fixtures/reverse-stages.js";

// A negative pulse riding on the supply through a P-FET (issue 19 item 11): the battery behind the
// requirement's source resistance Rb and the generator behind Ri as one Thevenin source. Outside
// reference: the limit Rb → ∞ of the superposition is the generator alone — the same pulse
// applied with the supply disconnected (its base the same level) — and Rb = 0 the battery alone.

const VB = 12;
const event: ReviewTurnOff = {
  inputAfterV: 0,
  outputV: VB,
  loopResistanceOhm: 0.02,
  loopInductanceH: 1e-9,
  capacitanceF: 1e-6,
  esrOhm: 0,
  repetitive: false,
  gateLagS: 47e-6,
};
const req = { load: { kind: "constant-current" as const, currentA: 1 }, loadMinV: 9, ambientMaxC: 25 };
const riding: TransientPulse = {
  id: "riding",
  title: "a negative pulse on the supply",
  baseV: "supply",
  amplitudeV: -150,
  sourceResistanceOhm: 10,
  riseS: 1e-6,
  decayS: 46e-6,
  decayConvention: "to-10-percent",
  source: "test",
};
// The same generator declared at a fixed base equal to the supply: the disconnected-supply path.
const alone: TransientPulse = { ...riding, id: "alone", baseV: VB };
const ctx = {
  supplyNominalV: VB,
  supplyMaxV: 16,
  reverseV: 14,
  outputHeldV: VB,
  deratingFactor: 0.8,
  clampToStandoffRatio: 1.3,
};
const run = (p: TransientPulse, batteryOhm: number) => {
  const r = pulseBackConduction(
    event,
    req,
    pfetStage,
    25,
    { nominalV: VB, resistanceOhm: batteryOhm },
    [p],
    [transientStress(pfetStage, p, ctx)],
  )[0];
  if (r?.outcome !== "assessed") throw new Error(JSON.stringify(r));
  return r;
};

describe("a negative pulse riding on the supply at a P-FET", () => {
  it("Rb → ∞ (1e9 ohm) gives the figures of the same generator with the supply disconnected", () => {
    const far = run(riding, 1e9);
    const open = run(alone, 0);
    expect(open.batteryResistanceOhm).toBeUndefined();
    expect(far.batteryResistanceOhm).toBe(1e9);
    expect(open.channel).toBe("turned-off");
    expect(far.channel).toBe("turned-off");
    expect(relativeError(far.loopResistanceOhm, open.loopResistanceOhm)).toBeLessThan(1e-7);
    expect(Math.abs(far.inputPeakV - open.inputPeakV)).toBeLessThan(1e-5);
    for (const k of ["peakReverseCurrentA", "chargeLostC", "channelOffS"] as const)
      expect(relativeError(far[k] ?? 0, open[k] ?? 1)).toBeLessThan(1e-6);
    expect(Math.abs(far.outputMinV - open.outputMinV)).toBeLessThan(1e-5);
  });

  it("Rb = 0: the battery holds the input at the supply, the channel conducts throughout with no reverse current", () => {
    const stiff = run(riding, 0);
    expect(stiff.inputPeakV).toBe(VB);
    expect(stiff.inputAfterV).toBe(VB);
    expect(stiff.loopResistanceOhm).toBe(0);
    expect(stiff.channel).toBe("conducts-throughout");
    expect(stiff.peakReverseCurrentA).toBe(0);
    expect(stiff.outputMinV).toBeGreaterThan(VB - 0.1);
  });

  it("a weak battery (10 ohm, equal to Ri): the input falls to the midpoint −63 V and the 1 uF output follows until the gate lets go", () => {
    const weak = run(riding, 10);
    expect(weak.inputPeakV).toBeCloseTo(-63, 9);
    expect(weak.loopResistanceOhm).toBeCloseTo(5, 12);
    expect(weak.channel).toBe("turned-off");
    expect(weak.outputMinV).toBeLessThan(0);
    // less severe than the generator alone: the battery holds part of the node
    expect(weak.peakReverseCurrentA).toBeLessThan(run(alone, 0).peakReverseCurrentA);
  });

  // Source: ngspice on the two-source circuit: the battery 12 V behind 2 ohm, the generator an EXP
  // source from −138 V back to 12 V (τ = 20 us) behind 10 ohm, a P-FET (switch on v(g) > 2 V, body
  // diode) whose gate lags the output by 100 kOhm × 3 nF = 0.3 ms, 1 uF and a 1 A load.
  const hasSpice = toolAvailable("ngspice");
  it.skipIf(!hasSpice)(
    "a slow gate: the channel conducts throughout, the output dips below 0 V and recovers; its lowest point within 1 % of ngspice",
    () => {
      const slow = pulseBackConduction(
        { ...event, gateLagS: 3e-4 },
        req,
        pfetStage,
        25,
        { nominalV: VB, resistanceOhm: 2 },
        [riding],
        [transientStress(pfetStage, riding, ctx)],
      )[0];
      if (slow?.outcome !== "assessed") throw new Error(JSON.stringify(slow));
      expect(slow.channel).toBe("conducts-throughout");
      expect(slow.outputMinV).toBeLessThan(0);
      const rows = runNgspice(`pfet slow gate two sources
Vb bat 0 DC 12
Rb bat in 2
Vg gen 0 EXP(-138 12 0 20u 1 1)
Ri gen in 10
L1 in b 1n IC=1
S1 b out g 0 smod
D1 b out dbody
C1 out 0 1u IC=12
I1 out 0 DC 1
E1 e 0 out 0 1
Rg e g 100k
Cg g 0 3n IC=12
.model smod SW(VT=2 VH=0 RON=0.005 ROFF=1e9)
.model dbody D(BV=60 IBV=1m N=1 RS=1m)
.tran 2n 200u UIC
.control
set wr_singlescale
run
wrdata out.txt v(out) v(g) l1#branch
quit
.endc
.end
`);
      const lowest = (xs: readonly number[]) => xs.reduce((a, b) => Math.min(a, b), Number.POSITIVE_INFINITY);
      expect(lowest(rows.map((row) => row[2] ?? 0))).toBeGreaterThan(2);
      expect(relativeError(slow.outputMinV, lowest(rows.map((row) => row[1] ?? 0)))).toBeLessThan(0.01);
      expect(relativeError(slow.peakReverseCurrentA, -lowest(rows.map((row) => row[3] ?? 0)))).toBeLessThan(0.01);
    },
  );
});
