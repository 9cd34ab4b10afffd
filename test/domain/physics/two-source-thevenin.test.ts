import { describe, expect, it } from "vitest";
import { type TurnOffModel, type TurnOffOutcome, turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { type TwoSources, twoSourceThevenin } from "../../../domain/physics/two-source-thevenin.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";
import { pfetStage } from "../../fixtures/reverse-stages.js";

// A negative pulse riding on the supply (issue 19 item 11): the battery behind Rb and the pulse
// generator behind Ri reduced to one Thevenin source Vth(t) = (Vb·Ri + Vg(t)·Rb)/(Ri + Rb) behind
// Ri‖Rb. Outside references: the two limits of the superposition (closed form) and ngspice on the
// direct two-source circuit with the same P-FET stage as turn-off-decaying-input.test.ts.

const pulse: TwoSources = {
  batteryV: 12,
  batteryOhm: 10,
  generatorBaseV: 12,
  generatorAmplitudeV: -150,
  generatorOhm: 10,
};

describe("two sources behind their resistances, seen as one", () => {
  it("Rb → ∞ is the generator alone (the supply disconnected); Rb = 0 the battery alone", () => {
    const open = twoSourceThevenin({ ...pulse, batteryOhm: 1e15, generatorBaseV: 0 });
    expect(open.finalV).toBeCloseTo(0, 9);
    expect(open.startV).toBeCloseTo(-150, 9);
    expect(relativeError(open.resistanceOhm, 10)).toBeLessThan(1e-12);
    const stiff = twoSourceThevenin({ ...pulse, batteryOhm: 0 });
    expect(stiff).toEqual({ finalV: 12, startV: 12, resistanceOhm: 0 });
    // equal resistances: the midpoint of the two sources, half of either resistance
    expect(twoSourceThevenin(pulse)).toEqual({ finalV: 12, startV: -63, resistanceOhm: 5 });
  });

  const hasSpice = toolAvailable("ngspice");
  const VTH = 2;
  const TAU = 20e-6;
  const model = (capacitanceF: number, batteryOhm: number, outputV: number): TurnOffModel => {
    const th = twoSourceThevenin({ ...pulse, batteryOhm });
    return {
      stage: pfetStage,
      outputV,
      inputAfterV: th.finalV,
      inputDecay: { startV: th.startV, tauS: TAU },
      loopResistanceOhm: th.resistanceOhm,
      loopInductanceH: 1e-9,
      capacitanceF,
      esrOhm: 0,
      load: { kind: "constant-current", currentA: 1 },
      loadMinV: 9,
      tjC: 25,
      gateLagS: (1e4 * 47e-9) / 10,
    };
  };
  // Source: ngspice on the circuit itself: the battery (12 V behind 10 ohm) and the generator (an
  // EXP source from −138 V back to 12 V, τ = 20 us, behind 10 ohm) both at the input node; the
  // output starts at its steady level with the 1 A load (12 V less 1 A through Ri‖Rb and the channel).
  const spice = (capacitanceF: number, batteryOhm: number, outputV: number) =>
    runNgspice(`pfet two sources
Vb bat 0 DC 12
Rb bat in ${batteryOhm}
Vg gen 0 EXP(-138 12 0 20u 1 1)
Ri gen in 10
L1 in b 1n IC=1
S1 b out g 0 smod
D1 b out dbody
C1 out 0 ${capacitanceF} IC=${outputV}
I1 out 0 DC 1
E1 e 0 out 0 1
Rg e g 10k
Cg g 0 4.7n IC=${outputV}
.model smod SW(VT=${VTH} VH=0 RON=0.005 ROFF=1e9)
.model dbody D(BV=60 IBV=1m N=1 RS=1m)
.tran 2n 150u UIC
.control
set wr_singlescale
run
wrdata out.txt v(out) v(g) l1#branch
quit
.endc
.end
`);
  const lowest = (xs: readonly number[]) => xs.reduce((a, b) => Math.min(a, b), Number.POSITIVE_INFINITY);
  const gateOf = (r: TurnOffOutcome) => {
    if (r.outcome !== "does-not-block") throw new Error(r.outcome);
    return r;
  };

  it.skipIf(!hasSpice)(
    "1 uF output: the channel lets go; turn-off, output minimum and reverse peak within 1 % of ngspice",
    () => {
      // An illustrative weak battery, 10 ohm: Vth falls to −63 V and the 1 uF output follows it down.
      const v0 = 12 - 1 * (5 + 0.005);
      const r = gateOf(turnOffEvent(model(1e-6, 10, v0)));
      const g = r.gateTurnOff;
      if (g === undefined) throw new Error("the gate did not turn the channel off");
      const rows = spice(1e-6, 10, v0);
      const off = rows.find((row) => (row[2] ?? Number.POSITIVE_INFINITY) < VTH)?.[0] ?? Number.NaN;
      // Up to the turn-off: the loop current is forward again there (the input rising back), and the
      // body diode's forward drop after it (≈ 0.6 V lower in ngspice) is not in the event model.
      const minOut = lowest(rows.filter((row) => (row[0] ?? 0) <= off).map((row) => row[1] ?? 0));
      const peak = -lowest(rows.map((row) => row[3] ?? 0));
      expect(relativeError(g.channelOffS, off)).toBeLessThan(0.01);
      expect(relativeError(g.outputMinV, minOut)).toBeLessThan(0.01);
      expect(relativeError(g.peakReverseCurrentA, peak)).toBeLessThan(0.01);
    },
  );

  it.skipIf(!hasSpice)(
    "470 uF output: the output holds, the channel conducts backwards into the pulse; its reverse peak and the output minimum within 1 % of ngspice",
    () => {
      // A battery with its wiring at 0.5 ohm: Vth dips to 4.9 V, the 470 uF output barely moves.
      const rth = (10 * 0.5) / 10.5;
      const v0 = 12 - 1 * (rth + 0.005);
      const r = gateOf(turnOffEvent(model(470e-6, 0.5, v0)));
      expect(r.gateTurnOff).toBeUndefined();
      const rows = spice(470e-6, 0.5, v0);
      expect(lowest(rows.map((row) => row[2] ?? 0))).toBeGreaterThan(VTH);
      const peak = -lowest(rows.map((row) => row[3] ?? 0));
      const minOut = lowest(rows.map((row) => row[1] ?? 0));
      expect(relativeError(r.peakReverseCurrentA, peak)).toBeLessThan(0.01);
      // the output's dip below its starting level
      expect(relativeError(v0 - r.outputMinV, v0 - minOut)).toBeLessThan(0.01);
    },
  );
});
