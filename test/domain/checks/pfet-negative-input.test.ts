import { describe, expect, it } from "vitest";
import { type TurnOffModel, turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";
import { pfetStage } from "../../fixtures/reverse-stages.js";

// A P-FET with its gate at ground under a negative input (issue 19 item 11): the output capacitor
// discharges back through the channel until the gate, lagging the output through Rg·Qg/Vgs, turns
// it off (domain/checks/pfet-gate-off.ts). Outside references: the RC discharge closed form
// (the loop's inductance is 1 nH, its L/R 20 ns against R·C = 23.5 us: the RC limit holds to
// ~0.1 %), the first-order lag of that exponential in closed form, and ngspice on the same circuit
// (a switch driven by an R-C copy of the output, and a breakdown diode as the body diode).

const R = 0.05; // 45 mOhm loop + the channel's 5 mOhm at |Vgs| 12 V, 25 degC
const C = 470e-6;
const RC = R * C;
const V0 = 12;
const VIN = -14;
const IL = 1;
const VTH = 2;
const event: TurnOffModel = {
  stage: pfetStage,
  outputV: V0,
  inputAfterV: VIN,
  loopResistanceOhm: 0.045,
  loopInductanceH: 1e-9,
  capacitanceF: C,
  esrOhm: 0,
  load: { kind: "constant-current", currentA: IL },
  loadMinV: 9,
  tjC: 25,
};
// RC discharge toward Vf = Vin − IL·R: Vout(t) = Vf + D·e^(−t/RC), D = V0 − Vf.
const VF = VIN - IL * R;
const D = V0 - VF;
const vout = (t: number) => VF + D * Math.exp(-t / RC);

function gateOf(r: ReturnType<typeof turnOffEvent>) {
  if (r.outcome !== "does-not-block" || r.gateTurnOff === undefined) throw new Error(`no gate turn-off: ${r.outcome}`);
  return r.gateTurnOff;
}

describe("P-FET under a negative input (constant level)", () => {
  it("no gate lag: the channel turns off where the output crosses its threshold, t = RC·ln(D/(Vth − Vf)) (RC closed form)", () => {
    const r = turnOffEvent(event);
    const g = gateOf(r);
    const tOff = RC * Math.log(D / (VTH - VF));
    expect(relativeError(g.channelOffS, tOff)).toBeLessThan(2e-3);
    expect(g.outputAtOffV).toBeCloseTo(VTH, 6);
    // The reverse peak at the start, (V0 − Vin)/R = 520 A in the RC limit; the inductance's rise
    // (peak near L/R·ln(R²C/L) ≈ 0.14 us, the output down by e^(−0.14/23.5) by then) costs ~0.6 %.
    expect(relativeError(g.peakReverseCurrentA, (V0 - VIN) / R)).toBeLessThan(1e-2);
    expect(g.peakReverseCurrentA).toBeLessThan((V0 - VIN) / R);
    // Charge lost: C·(V0 − Vth) to the turn-off, and the clamp phase's few ns add ~1 uC.
    expect(relativeError(g.chargeLostC, C * (V0 - VTH))).toBeLessThan(1e-3);
    expect(g.outputMinV).toBeGreaterThan(VTH - 0.01);
    if (r.outcome === "does-not-block") expect(r.outputMinV).toBe(g.outputMinV);
  });

  it("gate lag 2·RC (10 kOhm, 47 nC at 10 V): the output follows the input below 0 V (lagged-exponential closed form)", () => {
    const lag = (1e4 * 47e-9) / 10;
    const r = turnOffEvent({ ...event, gateLagS: lag });
    const g = gateOf(r);
    // u' = (Vout − u)/τg from u(0) = V0: u(t) = Vf + D·k·e^(−t/RC) + (V0 − Vf − D·k)·e^(−t/τg), k = RC/(RC − τg).
    const k = RC / (RC - lag);
    const u = (t: number) => VF + D * k * Math.exp(-t / RC) + (V0 - VF - D * k) * Math.exp(-t / lag);
    let lo = 0;
    let hi = 20 * RC;
    for (let i = 0; i < 200; i += 1) {
      const mid = (lo + hi) / 2;
      if (u(mid) > VTH) lo = mid;
      else hi = mid;
    }
    expect(relativeError(g.channelOffS, lo)).toBeLessThan(2e-3);
    expect(g.gateLagS).toBeCloseTo(lag, 15);
    // By hand: x = e^(−t/(2RC)) solves 26.05·x² − 52.1·x + 16.05 = 0, x ≈ 0.380: Vout ≈ −10.3 V.
    expect(Math.abs(g.outputAtOffV - vout(lo))).toBeLessThan(0.02);
    expect(g.outputMinV).toBeLessThan(-10);
    expect(relativeError(g.chargeLostC, C * (V0 - vout(lo)))).toBeLessThan(2e-3);
  });

  it("a constant positive input above the threshold keeps the channel on, as before (no gate turn-off)", () => {
    const r = turnOffEvent({ ...event, inputAfterV: 5 });
    expect(r.outcome).toBe("does-not-block");
    if (r.outcome === "does-not-block") {
      expect(r.gateTurnOff).toBeUndefined();
      expect(r.settlesAtV).toBeCloseTo(5 - IL * R, 3);
    }
  });

  const hasSpice = toolAvailable("ngspice");
  // Source: ngspice on the same circuit: the channel a switch (VT = Vth, no hysteresis, RON = Rds)
  // driven by an R-C copy of the output (the gate lag), the body diode a breakdown diode at 60 V.
  it.skipIf(!hasSpice)(
    "gate lag 2·RC: the turn-off time, the output's minimum and the reverse peak within 1 % of ngspice",
    () => {
      const rows = runNgspice(`pfet negative input
V1 in 0 DC ${VIN}
R1 in a 0.045
L1 a b 1n IC=${IL}
S1 b out g 0 smod
D1 b out dbody
C1 out 0 ${C} IC=${V0}
I1 out 0 DC ${IL}
E1 e 0 out 0 1
Rg e g 10k
Cg g 0 4.7n IC=${V0}
.model smod SW(VT=${VTH} VH=0 RON=0.005 ROFF=1e9)
.model dbody D(BV=60 IBV=1m N=1 RS=1m)
.tran 2n 50u UIC
.control
set wr_singlescale
run
wrdata out.txt v(out) v(g) l1#branch
quit
.endc
.end
`);
      const g = gateOf(turnOffEvent({ ...event, gateLagS: (1e4 * 47e-9) / 10 }));
      const off = rows.find((row) => (row[2] ?? Number.POSITIVE_INFINITY) < VTH)?.[0] ?? Number.NaN;
      // Up to just past the turn-off (~45 us): afterwards only the 1 A load drains the capacitor.
      const minOut = Math.min(
        ...rows.filter((row) => (row[0] ?? 0) <= off + 1e-6).map((row) => row[1] ?? Number.POSITIVE_INFINITY),
      );
      const peak = Math.max(...rows.map((row) => -(row[3] ?? 0)));
      expect(relativeError(g.channelOffS, off)).toBeLessThan(0.01);
      expect(relativeError(g.outputMinV, minOut)).toBeLessThan(0.01);
      expect(relativeError(g.peakReverseCurrentA, peak)).toBeLessThan(0.01);
    },
  );
});
