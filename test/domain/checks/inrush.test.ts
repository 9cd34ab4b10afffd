import { describe, expect, it } from "vitest";
import { type InrushCircuit, inrushCharge } from "../../../domain/checks/inrush.js";
import { inrushSoa } from "../../../domain/checks/inrush-soa.js";
import { relativeError } from "../../helpers/tolerance.js";

// Closed forms of circuit theory (docs/references.md "Inrush"): the charge of a capacitor
// through a pass element, and a first-order Foster term's response to a linear power ramp.

/** ∫P dt of the waveform by the trapezoid rule (a conservation check of the closed-form energy). */
function integratedEnergyJ(c: InrushCircuit, steps = 200_000): number {
  const w = inrushCharge(c);
  if (w.outcome !== "charges") throw new Error("no charge");
  const dt = w.spanS / steps;
  let e = 0;
  for (let k = 0; k < steps; k += 1) e += 0.5 * dt * (w.powerW(k * dt) + w.powerW((k + 1) * dt));
  return e;
}

const C = 470e-6;
const VIN = 16;

describe("inrush charge of the output capacitance (closed forms)", () => {
  it("a controlled slew into a pure capacitor loses ½·C·V² in the pass element (the capacitor stores as much)", () => {
    const c: InrushCircuit = {
      inputV: VIN,
      capacitanceF: C,
      load: { kind: "none" },
      drive: { kind: "slew", slewVPerS: 1000 },
    };
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    expect(w.energyJ).toBeCloseTo(0.5 * C * VIN * VIN, 12); // 60.16 mJ
    expect(w.chargeTimeS).toBeCloseTo(0.016, 12);
    expect(w.peakCurrentA).toBeCloseTo(C * 1000, 12); // I = C·dV/dt = 0.47 A
    expect(relativeError(integratedEnergyJ(c), w.energyJ)).toBeLessThan(1e-6);
  });

  it("a slew with a resistive load adds Vin³/(6·RL·s), and its loss peaks inside the ramp at v* = (Vin − C·s·RL)/2", () => {
    const c: InrushCircuit = {
      inputV: VIN,
      capacitanceF: C,
      load: { kind: "resistive", resistanceOhm: 8 },
      drive: { kind: "slew", slewVPerS: 1000 },
    };
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    expect(w.energyJ).toBeCloseTo(0.5 * C * VIN ** 2 + VIN ** 3 / (6 * 8 * 1000), 12);
    expect(relativeError(integratedEnergyJ(c), w.energyJ)).toBeLessThan(1e-6);
    // v* = (16 − 0.47·8)/2 = 6.12 V; P* = (16 − 6.12)·(0.47 + 6.12/8) = 12.20 W.
    expect(w.peakPowerW).toBeCloseTo((16 - 6.12) * (0.47 + 6.12 / 8), 9);
    let brute = 0;
    for (let k = 0; k <= 10_000; k += 1) brute = Math.max(brute, w.powerW((k / 10_000) * w.chargeTimeS));
    expect(w.peakPowerW).toBeGreaterThanOrEqual(brute - 1e-9);
  });

  it("a current limit into a capacitor with a constant-current load charges in C·V/(Ilim − IL)", () => {
    const c: InrushCircuit = {
      inputV: 12,
      capacitanceF: 1e-3,
      load: { kind: "constant-current", currentA: 2 },
      drive: { kind: "current-limit", limitA: 5 },
    };
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    expect(w.chargeTimeS).toBeCloseTo(4e-3, 12); // 1 mF·12 V / 3 A
    expect(w.energyJ).toBeCloseTo(0.12, 12); // 5 A·12 V·4 ms / 2
    expect(w.peakPowerW).toBe(60);
    expect(relativeError(integratedEnergyJ(c), w.energyJ)).toBeLessThan(1e-6);
  });

  it("a current limit with a resistive load follows V = Ilim·RL·(1 − e^(−t/RL·C)) (checked by a fine Euler step of C·dV/dt = Ilim − V/RL)", () => {
    const c: InrushCircuit = {
      inputV: 12,
      capacitanceF: 1e-3,
      load: { kind: "resistive", resistanceOhm: 4 },
      drive: { kind: "current-limit", limitA: 5 },
    };
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    let v = 0;
    let t = 0;
    let e = 0;
    const dt = 1e-8;
    while (v < 12) {
      e += (12 - v) * 5 * dt;
      v += ((5 - v / 4) / 1e-3) * dt;
      t += dt;
    }
    expect(relativeError(w.chargeTimeS, t)).toBeLessThan(1e-4); // −4 ms·ln(1 − 12/20) = 3.665 ms
    expect(relativeError(w.energyJ, e)).toBeLessThan(1e-4);
  });

  it("an uncontrolled charge loses ½·C·V²·Rch/(Rch + Rloop) in the channel, peaking at Vin/Rt", () => {
    const c: InrushCircuit = {
      inputV: VIN,
      capacitanceF: C,
      load: { kind: "none" },
      drive: { kind: "uncontrolled", channelOhm: 0.012, loopOhm: 0.03 },
    };
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    expect(w.energyJ).toBeCloseTo((0.5 * C * VIN * VIN * 0.012) / 0.042, 12);
    expect(w.peakCurrentA).toBeCloseTo(VIN / 0.042, 9);
    expect(w.chargeTimeS).toBeCloseTo(0.042 * C * Math.log(100), 12);
    expect(relativeError(integratedEnergyJ(c), w.energyJ)).toBeLessThan(1e-4); // the tail beyond 10 τ: e^(−20)
  });

  it("stalls where the load takes the whole limit: an explicit outcome with the stall voltage", () => {
    const cc = inrushCharge({
      inputV: 12,
      capacitanceF: 1e-3,
      load: { kind: "constant-current", currentA: 5 },
      drive: { kind: "current-limit", limitA: 5 },
    });
    expect(cc).toMatchObject({ outcome: "stalls", stallV: 0, stallPowerW: 60 });
    const r = inrushCharge({
      inputV: 12,
      capacitanceF: 1e-3,
      load: { kind: "resistive", resistanceOhm: 2 },
      drive: { kind: "current-limit", limitA: 5 },
    });
    expect(r).toMatchObject({ outcome: "stalls", stallV: 10, stallPowerW: 10 });
  });
});

describe("Tj during the inrush (the thermally limited SOA)", () => {
  // Current limit 5 A, 1 mF, 12 V, 2 A load: P(t) = P0·(1 − t/T), P0 = 60 W, T = 4 ms. One Foster
  // term R, τ: ΔT(t) = R·[P0·(1 − e^(−t/τ)) − (P0/T)·(t − τ·(1 − e^(−t/τ)))] (convolution of the ramp
  // with the term's impulse response (R/τ)·e^(−t/τ)).
  const R = 1.5;
  const TAU = 2e-3;
  const P0 = 60;
  const T = 4e-3;
  const rise = (t: number) => R * (P0 * -Math.expm1(-t / TAU) - (P0 / T) * (t + TAU * Math.expm1(-t / TAU)));
  const base = {
    inputV: 12,
    capacitanceF: 1e-3,
    load: { kind: "constant-current", currentA: 2 } as const,
    drive: { kind: "current-limit", limitA: 5 } as const,
    ambientC: 85,
    thermal: { kind: "foster", terms: [{ rKPerW: R, tauS: TAU }], steadyRthKPerW: 40 } as const,
  };
  let analyticPeak = 0;
  for (let k = 0; k <= 100_000; k += 1) analyticPeak = Math.max(analyticPeak, rise((k / 100_000) * T));

  it("the Foster junction's peak matches the closed form of a ramp", () => {
    const r = inrushSoa(base);
    if (r.outcome !== "charged") throw new Error(`expected charged, got ${r.outcome}`);
    expect((r.tjPeakC ?? 0) - 85).toBeCloseTo(analyticPeak, 2);
    expect(r.thermalModel).toBe("foster");
  });

  it("a thermal shutdown reached before the charge completes fails the start, at the closed form's crossing time", () => {
    const shutdownC = 85 + 0.6 * analyticPeak;
    const r = inrushSoa({ ...base, thermalShutdownC: shutdownC });
    if (r.outcome !== "thermal-shutdown") throw new Error(`expected thermal-shutdown, got ${r.outcome}`);
    let lo = 0;
    let hi = T;
    for (let k = 0; k < 60; k += 1) {
      const mid = (lo + hi) / 2;
      if (rise(mid) < shutdownC - 85) lo = mid;
      else hi = mid;
    }
    expect(relativeError(r.shutdownAtS, lo)).toBeLessThan(2e-3);
    expect(r.tjPeakC).toBe(shutdownC);
    expect(r.outputAtShutdownV).toBeCloseTo((3 * r.shutdownAtS) / 1e-3, 9);
    expect(r.reason).toMatch(/start fails/);
  });

  it("a shutdown above the peak leaves the charge complete", () => {
    expect(inrushSoa({ ...base, thermalShutdownC: 85 + analyticPeak + 1 }).outcome).toBe("charged");
  });

  it("without a transient network the pulse's Tj is not assessed, nor whether a shutdown comes first", () => {
    const r = inrushSoa({ ...base, thermal: { kind: "none", steadyRthKPerW: 40 }, thermalShutdownC: 160 });
    expect(r).toMatchObject({ outcome: "charged", thermalModel: "none", shutdownUnassessedC: 160 });
    expect("tjPeakC" in r).toBe(false);
  });

  it("a stalled output holds its loss: the steady junction, capped at a shutdown", () => {
    const stall = { ...base, load: { kind: "constant-current", currentA: 6 } as const };
    expect(inrushSoa(stall)).toMatchObject({ outcome: "does-not-charge", tjPeakC: 85 + 40 * 60 });
    expect(inrushSoa({ ...stall, thermalShutdownC: 160 })).toMatchObject({ outcome: "does-not-charge", tjPeakC: 160 });
  });
});
