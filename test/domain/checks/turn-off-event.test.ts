import { describe, expect, it } from "vitest";
import { turnOffEvent } from "../../../domain/checks/turn-off-event.js";
import { phaseEnergies } from "../../../domain/checks/turn-off-loop.js";
import { extremaTimes, loopSystem, type RlcLoop, stateAt } from "../../../domain/physics/rlc-series.js";
import { toolAvailable } from "../../helpers/external-tool.js";
import { runNgspice } from "../../helpers/ngspice.js";
import { relativeError } from "../../helpers/tolerance.js";
import { lowSideStage, pfetStage, pnStage, schottkyStage, turnOffFixture } from "../../fixtures/reverse-stages.js";

/**
 * Independent oracle: classical RK4 on the raw circuit (KCL at the output node solved for v_out
 * each step: i = (v_out − v_C)/ESR + I + G·v_out), fixed step, no use of the closed form.
 */
function rk4Loop(
  p: RlcLoop,
  x0: readonly [number, number],
  tEnd: number,
  steps: number,
): { t: number; i: number; vc: number }[] {
  const f = (i: number, vc: number): [number, number] => {
    const v = (i - p.loadCurrentA + vc / p.esrOhm) / (1 / p.esrOhm + p.loadConductanceS);
    return [(p.sourceV - p.loopResistanceOhm * i - v) / p.inductanceH, (v - vc) / p.esrOhm / p.capacitanceF];
  };
  const h = tEnd / steps;
  let [i, vc] = x0;
  const out = [{ t: 0, i, vc }];
  for (let k = 1; k <= steps; k += 1) {
    const k1 = f(i, vc);
    const k2 = f(i + (h / 2) * k1[0], vc + (h / 2) * k1[1]);
    const k3 = f(i + (h / 2) * k2[0], vc + (h / 2) * k2[1]);
    const k4 = f(i + h * k3[0], vc + h * k3[1]);
    i += (h / 6) * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]);
    vc += (h / 6) * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]);
    out.push({ t: k * h, i, vc });
  }
  return out;
}

const base: RlcLoop = {
  sourceV: 0,
  loopResistanceOhm: 0.01,
  inductanceH: 1e-6,
  capacitanceF: 100e-6,
  esrOhm: 0.005,
  loadCurrentA: 2,
  loadConductanceS: 0,
};
// Series R-L-C: ζ = (Rt/2)·√(C/L); Rt = 0.2 ohm is critical for L = 1 µH, C = 100 µF (textbook).
const cases: [string, RlcLoop][] = [
  ["under-damped, constant-current load", base],
  ["critically damped", { ...base, loopResistanceOhm: 0.195 }],
  ["over-damped", { ...base, loopResistanceOhm: 1.5 }],
  ["under-damped, resistive load", { ...base, loadCurrentA: 0, loadConductanceS: 1 / 6 }],
  ["over-damped, resistive load", { ...base, loopResistanceOhm: 0.8, loadCurrentA: 0, loadConductanceS: 1 / 6 }],
];

describe("series R-L-C closed form", () => {
  // Source: independent numerical integration (RK4) of the same circuit; peak within 0.5 %.
  it.each(cases)("%s: state and peak reverse current agree with RK4", (_name, p) => {
    const s = loopSystem(p);
    const x0: [number, number] = [p.loadCurrentA + p.loadConductanceS * 12, 12];
    const tEnd = 200e-6;
    const rows = rk4Loop(p, x0, tEnd, 40_000);
    let peakRk = 0;
    let maxErr = 0;
    for (const r of rows) {
      const x = stateAt(s, x0, r.t);
      peakRk = Math.max(peakRk, -r.i);
      maxErr = Math.max(maxErr, Math.abs(x[0] - r.i));
    }
    let peakCf = 0;
    for (const t of [0, ...extremaTimes(s, x0, [1, 0], tEnd, 2), tEnd])
      peakCf = Math.max(peakCf, -stateAt(s, x0, t)[0]);
    expect(relativeError(peakCf, peakRk)).toBeLessThan(0.005);
    expect(maxErr).toBeLessThan(1e-6 * Math.max(peakRk, 1));
  });

  // Source: continuity of the one formula across the regimes (c, s → 1, t at q = 0).
  it("is continuous through critical damping", () => {
    const at = (r: number): number => stateAt(loopSystem({ ...base, loopResistanceOhm: r }), [2, 12], 7e-6)[0];
    const crit = at(0.195);
    expect(relativeError(at(0.195 * (1 + 1e-9)), crit)).toBeLessThan(1e-6);
    expect(relativeError(at(0.195 * (1 - 1e-9)), crit)).toBeLessThan(1e-6);
  });

  const hasSpice = toolAvailable("ngspice");
  // Source: ngspice 39 transient of the same loop (UIC, inductor and capacitor initial conditions).
  it.skipIf(!hasSpice)("peak reverse current matches ngspice within 0.5 %", () => {
    const rows = runNgspice(`loop
V1 in 0 DC 0
R1 in a 0.01
L1 a out 1u IC=2
Resr out c 5m
C1 c 0 100u IC=12
I1 out 0 DC 2
.tran 1n 100u UIC
.control
set wr_singlescale
run
wrdata out.txt l1#branch
quit
.endc
.end
`);
    const spicePeak = Math.max(...rows.map((r) => -(r[1] ?? 0)));
    const s = loopSystem(base);
    const t = extremaTimes(s, [2, 12], [1, 0], 100e-6, 1)[0] ?? 0;
    expect(relativeError(-stateAt(s, [2, 12], t)[0], spicePeak)).toBeLessThan(0.005);
  });
});

const event = turnOffFixture;

describe("turn-off event", () => {
  it("controller: trips at threshold/Rds, turns off after the delay, clamp energy balances", () => {
    const r = turnOffEvent(event);
    expect(r.outcome).toBe("blocks");
    if (r.outcome !== "blocks" || r.clamp === undefined) return;
    // Source: the controller model itself: Rds(on) 5 mΩ at 10 V → trip at 0.03/0.005 = 6 A.
    const detect = r.detectS ?? 0;
    expect(r.turnOffS - detect).toBeCloseTo(2e-6, 12);
    // Source: di/dt = ΔV/L at the start (docs/references.md, turn-off): −(12 + 2·0.015)/1 µH.
    expect(relativeError(r.initialSlopeAPerS, -(12 + 2 * 0.015) / 1e-6)).toBeLessThan(1e-9);
    // Source: energy conservation over the conduction phase and over the clamp phase, 0.1 %.
    expect(Math.abs(r.energies.balanceResidual)).toBeLessThan(1e-3);
    expect(Math.abs(r.clamp.energies.balanceResidual)).toBeLessThan(1e-3);
    expect(r.peakReverseCurrentA).toBeCloseTo(r.clamp.currentAtTurnOffA, 9);
    expect(r.clamp.withinAvalancheRating).toBe(r.clamp.absorbedJ <= 0.05);
    // At a 25 °C start the rating is EAS itself; at 130 °C on a 175 °C part EAS·45/150 = 15 mJ
    // (closed form, docs/references.md "MOSFETs"), and the flag compares with that.
    expect(r.clamp.avalancheRatingAtTjJ).toBe(0.05);
    const hot = turnOffEvent({ ...event, tjC: 130 });
    if (hot.outcome !== "blocks" || hot.clamp === undefined) throw new Error("expected a clamp phase at 130 °C");
    expect(hot.clamp.avalancheRatingAtTjJ).toBeCloseTo((0.05 * 45) / 150, 15);
    expect(hot.clamp.withinAvalancheRating).toBe(hot.clamp.absorbedJ <= (0.05 * 45) / 150);
  });

  // Source: docs/references.md, E = ½·L·I²·Vcl/(Vcl − Vs) (unclamped inductive switching), which the
  // exact clamp phase approaches when R → 0 and C is large (the drive voltage stays constant).
  it("exact clamp energy approaches the clamped-inductance formula for a stiff output", () => {
    const r = turnOffEvent({ ...event, loopResistanceOhm: 1e-6, esrOhm: 1e-6, capacitanceF: 1 });
    if (r.outcome !== "blocks" || r.clamp === undefined) throw new Error(r.outcome);
    expect(relativeError(r.clamp.absorbedJ, r.clamp.clampedFormulaJ)).toBeLessThan(2e-3);
    expect(r.clamp.absorbedJ).toBeGreaterThan(r.clamp.inductiveEnergyJ);
  });

  it("P-FET does not block: the output drains into the short and falls below the minimum", () => {
    const r = turnOffEvent({ ...event, stage: pfetStage, load: { kind: "resistive", resistanceOhm: 6 } });
    expect(r.outcome).toBe("does-not-block");
    if (r.outcome !== "does-not-block") return;
    expect(r.fallsBelowMinS).toBeGreaterThan(0);
    // Source: energy conservation (0.1 %) up to the time the output reaches its minimum.
    expect(Math.abs(r.energies.balanceResidual)).toBeLessThan(1e-3);
    expect(r.end.outputV).toBeCloseTo(9, 6);
  });

  // Source: independent RK4 of the same loop over twice the span: the stage keeps conducting
  // after the output falls below the load's minimum, so the reverse current is followed until it
  // turns (it was reported at the window's end while still rising, and charted as the peak).
  it("P-FET does not block: the reverse peak is the current's maximum, past the end of the window", () => {
    const m = { ...event, stage: pfetStage, capacitanceF: 2200e-6, loopInductanceH: 2e-6 };
    const r = turnOffEvent(m);
    if (r.outcome !== "does-not-block") throw new Error(r.outcome);
    expect(r.peakReverseTimeS).toBeGreaterThan(r.end.timeS);
    expect(r.peakReverseCurrentA).toBeGreaterThan(-r.end.currentA);
    expect(r.peakReverseIsLowerBound).toBeUndefined();
    const p: RlcLoop = {
      sourceV: 0,
      loopResistanceOhm: r.loop.totalResistanceOhm,
      inductanceH: m.loopInductanceH,
      capacitanceF: m.capacitanceF,
      esrOhm: m.esrOhm,
      loadCurrentA: 2,
      loadConductanceS: 0,
    };
    const rows = rk4Loop(p, [r.initialCurrentA, m.outputV], 2 * r.peakReverseTimeS, 40_000);
    const best = rows.reduce((a, b) => (-b.i > -a.i ? b : a));
    expect(relativeError(r.peakReverseCurrentA, -best.i)).toBeLessThan(1e-6);
    expect(Math.abs(r.peakReverseTimeS - best.t)).toBeLessThan(1e-3 * r.peakReverseTimeS);
  });

  // Source: a series R-L-C with a negative conductance G = −P/V² across C (the constant-power
  // load's tangent) has trace A = −(R + ESR')/L − G'/C: negative damping where P/V² > C·(R + ESR)/L
  // (the negative-resistance oscillator; common practice for a converter behind an input L-C).
  // Checked by an independent RK4 of the same linear loop: the oscillation grows.
  it("constant-power load with negative damping: the unstable loop is its own outcome, every number finite", () => {
    const m = {
      ...event,
      stage: pfetStage,
      loopResistanceOhm: 0.001,
      esrOhm: 0.001,
      capacitanceF: 10e-6,
      loopInductanceH: 10e-6,
      load: { kind: "constant-power" as const, powerW: 100, minVoltageV: 6 },
    };
    // P/V² = 0.69 S against C·(R + ESR)/L = 0.0025 S (+ the stage's Rds(on)): negative damping.
    const r = turnOffEvent(m);
    if (r.outcome !== "unstable-loop") throw new Error(r.outcome);
    expect(r.mode).toBe("oscillation-grows");
    expect(r.dampingRatio).toBeLessThan(0);
    expect(r.growthPerS).toBeGreaterThan(0);
    expect(r.loadIncrementalResistanceOhm).toBeCloseTo(-(12 * 12) / 100, 12);
    expect(JSON.stringify(r)).not.toMatch(/null|NaN|Infinity/);
    const g = -100 / 144;
    const p: RlcLoop = {
      sourceV: 0,
      loopResistanceOhm: 0.001 + 0.012,
      inductanceH: 10e-6,
      capacitanceF: 10e-6,
      esrOhm: 0.001,
      loadCurrentA: 200 / 12,
      loadConductanceS: g,
    };
    const rows = rk4Loop(p, [100 / 12, 12], 20 / r.growthPerS, 40_000);
    const early = Math.max(...rows.slice(0, 2000).map((x) => Math.abs(x.i)));
    const late = Math.max(...rows.slice(-2000).map((x) => Math.abs(x.i)));
    expect(late).toBeGreaterThan(1e3 * early);
    // R·P/V² ≥ 1: a real growing mode.
    const d = turnOffEvent({
      ...m,
      loopResistanceOhm: 2,
      esrOhm: 0,
      load: { kind: "constant-power", powerW: 100, minVoltageV: 6 },
    });
    if (d.outcome !== "unstable-loop") throw new Error(d.outcome);
    expect(d.mode).toBe("diverges");
  });

  it("a turn-off at zero current has no clamp phase, and a zero-length window a meaningful balance", () => {
    // A diode that recovers at its zero crossing (no Qrr): the current at turn-off is rounding.
    const r = turnOffEvent({
      ...event,
      stage: pnStage,
      loopResistanceOhm: 0,
      esrOhm: 0,
      load: { kind: "resistive", resistanceOhm: 1 },
      outputV: 1,
      capacitanceF: 0.1,
      loopInductanceH: 1.136e-4,
    });
    if (r.outcome !== "blocks") throw new Error(r.outcome);
    expect(r.clamp).toBeUndefined();
    expect(Math.abs(r.energies.balanceResidual)).toBeLessThan(1e-6);
    // A window of zero length (a stage that turns off at t = 0) exchanges nothing: the residual
    // is rounding against the stored energy (it was 1: 2.7e-18 J of rounding against itself).
    const p: RlcLoop = {
      ...base,
      loopResistanceOhm: 1,
      esrOhm: 1,
      capacitanceF: 0.012,
      inductanceH: 1e-3,
      loadCurrentA: 1,
    };
    const e = phaseEnergies(p, [1, 0.9999999999999998], 0, 0);
    expect(Math.abs(e.balanceResidual)).toBeLessThan(1e-9);
  });

  // Circuit reasoning (ngspice in test/domain/review/pulse-back-conduction-low-side.test.ts): a
  // low-side N-FET's gate is fed from the positive rail against its source at the module's ground,
  // so its Vgs is the output, as a P-FET's |Vgs| is: the same part in the same loop, the same event.
  it("low-side N-FET: its gate sees the output, so a hard short turns it off as a P-FET's; a lower input keeps it on", () => {
    const short = turnOffEvent({ ...event, stage: lowSideStage });
    if (short.outcome !== "does-not-block") throw new Error(short.outcome);
    expect(short.gateTurnOff?.outputAtOffV).toBeCloseTo(2, 6);
    expect({ ...short, reason: "" }).toEqual({ ...turnOffEvent({ ...event, stage: pfetStage }), reason: "" });
    const lower = turnOffEvent({ ...event, stage: lowSideStage, inputAfterV: 10 });
    if (lower.outcome !== "does-not-block") throw new Error(lower.outcome);
    expect(lower.gateTurnOff).toBeUndefined();
  });

  // Source: charge-control recovery: the reverse charge drawn after the zero crossing equals Qrr.
  it("diode: reverse current flows until Qrr is drawn", () => {
    const qrr = 50e-9;
    const r = turnOffEvent({ ...event, stage: schottkyStage, reverseRecoveryChargeC: qrr });
    if (r.outcome !== "blocks") throw new Error(r.outcome);
    const zero = r.detectS ?? 0;
    // with di/dt ≈ −ΔV/L near the zero crossing, Q = ½·(dI/dt)·t² → t = √(2Q/|di/dt|)
    const slope = Math.abs(r.initialSlopeAPerS);
    expect(relativeError(r.turnOffS - zero, Math.sqrt((2 * qrr) / slope))).toBeLessThan(0.01);
  });
});
