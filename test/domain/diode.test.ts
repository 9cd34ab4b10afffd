import { describe, expect, it } from "vitest";
import { cToK, thermalVoltageV } from "../../domain/physics/constants.js";
import { type DiodeParams, diodeCurrentA, diodeVoltageV, saturationCurrentAt } from "../../domain/physics/diode.js";
import { fitDiode } from "../../domain/physics/diode-fit.js";
import { toolAvailable } from "../helpers/external-tool.js";
import { runNgspice } from "../helpers/ngspice.js";
import { relativeError } from "../helpers/tolerance.js";

const banwell: DiodeParams = {
  saturationCurrentA: 25e-15,
  ideality: 1,
  seriesResistanceOhm: 0.3,
  energyGapEv: 1.11,
  saturationTempExponent: 3,
  nominalTempK: 300,
};

/** Independent check: Newton on f(I) = V − n·Vt·ln(I/Is + 1) − I·Rs, started from V/Rs. */
function newtonCurrent(p: DiodeParams, v: number, tK: number): number {
  const is = saturationCurrentAt(p, tK);
  const nvt = p.ideality * thermalVoltageV(tK);
  let i = Math.max(v / p.seriesResistanceOhm, 1e-3);
  for (let k = 0; k < 200; k += 1) {
    const f = v - nvt * Math.log(i / is + 1) - i * p.seriesResistanceOhm;
    const df = -nvt / (i + is) - p.seriesResistanceOhm;
    let next = i - f / df;
    if (next <= 0) next = i / 10;
    if (Math.abs(next - i) < 1e-16 * i) return next;
    i = next;
  }
  return i;
}

describe("diode with series resistance", () => {
  // Source: T. C. Banwell and A. Jayakumar, Electronics Letters 36(4), 2000, worked example
  // (Is = 25 fA, n = 1, Rs = 0.3 ohm, 300 K); values recomputed in docs/references.md [C].
  it("reproduces the Banwell-Jayakumar example", () => {
    expect(diodeCurrentA(banwell, 0.8, 300) * 1e3).toBeCloseTo(138.242, 2);
    expect(diodeCurrentA(banwell, 1.0, 300) * 1e3).toBeCloseTo(669.029, 2);
  });

  // Source: the exact Lambert-W solution (Banwell & Jayakumar 2000) against an independent Newton
  // solve of the implicit Shockley equation, 1e-9 relative.
  it.each([0.3, 0.5, 0.7, 0.8, 1.0, 2, 5, 20])("Lambert W agrees with Newton at %f V", (v) => {
    for (const tK of [233.15, 300, 398.15]) {
      expect(relativeError(diodeCurrentA(banwell, v, tK), newtonCurrent(banwell, v, tK))).toBeLessThan(1e-9);
    }
  });

  it("V(I) and I(V) are inverse to each other, and a huge voltage stays finite (Wright omega)", () => {
    for (const i of [1e-9, 1e-3, 0.1, 3, 30]) {
      expect(relativeError(diodeCurrentA(banwell, diodeVoltageV(banwell, i, 330), 330), i)).toBeLessThan(1e-9);
    }
    const big = diodeCurrentA(banwell, 1e4, 300);
    expect(Number.isFinite(big)).toBe(true);
    expect(relativeError(big, (1e4 - 0.9) / 0.3)).toBeLessThan(1e-3);
  });

  // Source: the standard SPICE level-1 diode, run in ngspice 39 (Debian) on the same IS, N, RS,
  // EG, XTI: forward voltage within 1 mV at 0.01..10 A, 25 °C and 100 °C.
  const hasSpice = toolAvailable("ngspice");
  it.skipIf(!hasSpice)("matches ngspice's diode model within 1 mV", () => {
    const cases: DiodeParams[] = [
      {
        saturationCurrentA: 2e-9,
        ideality: 1.6,
        seriesResistanceOhm: 0.025,
        energyGapEv: 1.11,
        saturationTempExponent: 3,
        nominalTempK: cToK(25),
      },
      {
        saturationCurrentA: 5e-6,
        ideality: 1.05,
        seriesResistanceOhm: 0.04,
        energyGapEv: 0.69,
        saturationTempExponent: 2,
        nominalTempK: cToK(25),
      },
    ];
    for (const p of cases) {
      for (const tC of [25, 100]) {
        const rows = runNgspice(`diode oracle
.model dm D(IS=${p.saturationCurrentA} N=${p.ideality} RS=${p.seriesResistanceOhm} EG=${p.energyGapEv} XTI=${p.saturationTempExponent} TNOM=25)
I1 0 a 1
D1 a 0 dm
.options temp=${tC}
.control
dc I1 0.01 10 0.01
wrdata out.txt v(a)
quit
.endc
.end
`);
        expect(rows.length).toBeGreaterThan(900);
        let worst = 0;
        for (const [i, v] of rows) {
          if (i === undefined || v === undefined) continue;
          worst = Math.max(worst, Math.abs(diodeVoltageV(p, i, cToK(tC)) - v));
        }
        if (process.env.BACKSTOP_REPORT)
          console.log(`ngspice diode worst |dV| ${tC} degC: ${worst.toExponential(2)} V`);
        expect(worst).toBeLessThan(1e-3);
      }
    }
  });
});

describe("diode fit from datasheet points", () => {
  const opts = { energyGapEv: 0.69, saturationTempExponent: 2, nominalTempK: cToK(25) };
  // Closed-form check by substitution: the fitted law passes through the points it was fitted to.
  it("two points are reproduced within 1 mV", () => {
    const pts = [
      { currentA: 0.1, voltageV: 0.3, tempK: cToK(25) },
      { currentA: 5, voltageV: 0.7, tempK: cToK(25) },
    ];
    const fit = fitDiode(pts, opts);
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    for (const pt of pts)
      expect(Math.abs(diodeVoltageV(fit.params, pt.currentA, pt.tempK) - pt.voltageV)).toBeLessThan(1e-3);
  });
  it("three points at two temperatures give Is, n and Rs through all three", () => {
    const truth: DiodeParams = { saturationCurrentA: 3e-6, ideality: 1.1, seriesResistanceOhm: 0.03, ...opts };
    const pts = [
      { currentA: 0.05, tempK: cToK(25) },
      { currentA: 2, tempK: cToK(25) },
      { currentA: 8, tempK: cToK(125) },
    ].map((p) => ({ ...p, voltageV: diodeVoltageV(truth, p.currentA, p.tempK) }));
    const fit = fitDiode(pts, opts);
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    expect(relativeError(fit.params.ideality, 1.1)).toBeLessThan(1e-4);
    expect(relativeError(fit.params.seriesResistanceOhm, 0.03)).toBeLessThan(1e-3);
    for (const pt of pts)
      expect(Math.abs(diodeVoltageV(fit.params, pt.currentA, pt.tempK) - pt.voltageV)).toBeLessThan(1e-3);
  });
  it("refuses points that imply a negative series resistance", () => {
    const pts = [
      { currentA: 0.1, voltageV: 0.3, tempK: cToK(25) },
      { currentA: 1, voltageV: 0.6, tempK: cToK(25) },
      { currentA: 10, voltageV: 0.65, tempK: cToK(25) },
    ];
    const fit = fitDiode(pts, opts);
    expect(fit.ok).toBe(false);
  });
});

describe("linear forward-voltage temperature coefficient", () => {
  const tc = -0.002;
  const d: DiodeParams = {
    saturationCurrentA: 1e-9,
    ideality: 1.8,
    seriesResistanceOhm: 0.02,
    energyGapEv: 1.11,
    saturationTempExponent: 3,
    nominalTempK: cToK(25),
    linearTempCoVPerK: tc,
  };
  // By construction (docs/references.md, Diodes: a linear Vf temperature coefficient of about −2 mV/K):
  // at a current far above Is the curve shifts by tc·(T − T0), and I(V) stays its exact inverse.
  it("shifts the forward voltage by tc·ΔT at constant current", () => {
    for (const i of [0.01, 1, 5]) {
      for (const tC of [-40, 85, 150]) {
        // The "+1" of ln(I/Is + 1) departs from the pure shift by n·Vt·Is/I: below 10 µV here.
        expect(Math.abs(diodeVoltageV(d, i, cToK(tC)) - diodeVoltageV(d, i, cToK(25)) - tc * (tC - 25))).toBeLessThan(
          1e-5,
        );
        expect(relativeError(diodeCurrentA(d, diodeVoltageV(d, i, cToK(tC)), cToK(tC)), i)).toBeLessThan(1e-9);
      }
    }
  });
  // Closed form: a constant current I through the diode with Vf(T) = V0 + tc·(T − T0) and
  // Tj = Ta + Rth·I·Vf(Tj) gives Tj = (Ta + Rth·I·(V0 − tc·T0)) / (1 − Rth·I·tc).
  it("gives the closed-form self-heated junction temperature", async () => {
    const { solveOperatingPoint } = await import("../../domain/solve/electrothermal-point.js");
    const stage = {
      kind: "pn-diode" as const,
      diode: d,
      reverseRatingV: 100,
      tjMaxC: 175,
      thermal: { kind: "junction-ambient" as const, rthJaKPerW: 40 },
    };
    const r = solveOperatingPoint({
      stage,
      supplyV: 12,
      sourceResistanceOhm: 0,
      load: { kind: "constant-current", currentA: 2 },
      ambientC: 50,
      rthKPerW: 40,
    });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    const v0 = diodeVoltageV(d, 2, cToK(25));
    const closed = (50 + 40 * 2 * (v0 - tc * 25)) / (1 - 40 * 2 * tc);
    expect(Math.abs(r.point.tjC - closed)).toBeLessThan(1e-4);
  });
});
