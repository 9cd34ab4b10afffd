import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { type InrushCircuit, inrushCharge } from "../../../domain/checks/inrush.js";
import { inrushSoa } from "../../../domain/checks/inrush-soa.js";
import { relativeError } from "../../helpers/tolerance.js";

// The charge beside a constant-power load (domain/checks/inrush-constant-power.ts) against outside
// references (docs/references.md "Inrush"): RK4 of the circuit's own ODE, C·dV/dt = I − P/V above
// the converter's start voltage, with the pass element's loss integrated alongside; the trapezoid
// ∫P dt of the model's waveform; and conservation of energy, what the source gives = ½·C·V² into
// the capacitor + what the converter takes + what the pass element dissipates.

const C = 1e-3;
const VIN = 24;
const P = 40;
const VS = 10;

/** RK4 of [V, E] with dV/dt = (I − Iload(V))/C and dE/dt = (Vin − V)·I, until V reaches vEnd; the crossing interpolated. */
function rk4Limit(limitA: number, vEnd: number, steps: number, tMax: number) {
  const load = (v: number) => (v >= VS ? P / v : 0);
  const f = (v: number): [number, number] => [(limitA - load(v)) / C, (VIN - v) * limitA];
  const h = tMax / steps;
  let v = 0;
  let e = 0;
  let t = 0;
  const samples: [number, number][] = [];
  for (let k = 0; k < steps; k += 1) {
    const k1 = f(v);
    const k2 = f(v + 0.5 * h * k1[0]);
    const k3 = f(v + 0.5 * h * k2[0]);
    const k4 = f(v + h * k3[0]);
    const dv = (h / 6) * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]);
    const de = (h / 6) * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]);
    if (v + dv >= vEnd) {
      const f0 = (vEnd - v) / dv;
      return { tS: t + f0 * h, energyJ: e + f0 * de, samples };
    }
    v += dv;
    e += de;
    t += h;
    if (k % 1000 === 0) samples.push([t, v]);
  }
  return { tS: Number.NaN, energyJ: Number.NaN, samples, vAtEnd: v };
}

function trapezoidJ(c: InrushCircuit, steps = 400_000): number {
  const w = inrushCharge(c);
  if (w.outcome !== "charges") throw new Error("no charge");
  const dt = w.spanS / steps;
  let e = 0;
  for (let k = 0; k < steps; k += 1) e += 0.5 * dt * (w.powerW(k * dt) + w.powerW((k + 1) * dt));
  return e;
}

const cp = { kind: "constant-power", powerW: P, startV: VS } as const;

describe("inrush at a current limit beside a constant-power load", () => {
  const c: InrushCircuit = { inputV: VIN, capacitanceF: C, load: cp, drive: { kind: "current-limit", limitA: 5 } };

  it("charges in C·Vs/I + (C/I)·[(Vin − Vs) + (P/I)·ln((I·Vin − P)/(I·Vs − P))], as RK4 of C·dV/dt = I − P/V", () => {
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    // 1 mF·10 V/5 A = 2 ms, then (1 mF/5 A)·[14 V + 8 V·ln(80/10)] = 6.127 ms: 8.127 ms in all.
    const closed = (C * VS) / 5 + (C / 5) * (VIN - VS + (P / 5) * Math.log((5 * VIN - P) / (5 * VS - P)));
    expect(w.chargeTimeS).toBeCloseTo(closed, 15);
    expect(closed).toBeCloseTo(8.1271e-3, 6);
    const rk = rk4Limit(5, VIN, 400_000, 0.02);
    expect(relativeError(w.chargeTimeS, rk.tS)).toBeLessThan(1e-5);
    expect(relativeError(w.energyJ, rk.energyJ)).toBeLessThan(1e-5);
    // The waveform's V(t), inverted from t(V) by bisection, follows the integrated one.
    for (const [t, v] of rk.samples.filter(([t]) => t < w.chargeTimeS)) expect(w.outputV(t)).toBeCloseTo(v, 3);
  });

  it("the switch's loss conserves energy: I·Vin·T = ½·C·Vin² + P·(time above Vs) + E, and equals ∫(Vin − V)·I dt", () => {
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    const above = w.chargeTimeS - (C * VS) / 5;
    expect(relativeError(w.energyJ, 5 * VIN * w.chargeTimeS - 0.5 * C * VIN ** 2 - P * above)).toBeLessThan(1e-12);
    expect(relativeError(trapezoidJ(c), w.energyJ)).toBeLessThan(1e-6);
    expect(w.peakPowerW).toBe(5 * VIN);
    expect(w.currentA(w.chargeTimeS + 1e-6)).toBeCloseTo(P / VIN, 12);
  });

  it("tends to the no-load C·V/I as P → 0, and a converter that starts above the input never loads it", () => {
    const tiny = inrushCharge({ ...c, load: { ...cp, powerW: 1e-9 } });
    const high = inrushCharge({ ...c, load: { ...cp, startV: 30 } });
    const none = inrushCharge({ ...c, load: { kind: "none" } });
    if (tiny.outcome !== "charges" || high.outcome !== "charges" || none.outcome !== "charges")
      throw new Error("charge");
    expect(relativeError(tiny.chargeTimeS, (C * VIN) / 5)).toBeLessThan(1e-9);
    expect(high.chargeTimeS).toBe(none.chargeTimeS);
    expect(high.energyJ).toBe(none.energyJ);
  });

  it("a limit at or below P/Vs is an explicit stall at the converter's start (its lockout cycles), not NaN, and its Tj is finite", () => {
    // 3 A·5 V = 15 W < 20 W: at 5 V the converter takes more than the limit, so C·dV/dt = 3 − 20/5 < 0 there.
    const stall: InrushCircuit = {
      ...c,
      load: { kind: "constant-power", powerW: 20, startV: 5 },
      drive: { kind: "current-limit", limitA: 3 },
    };
    const w = inrushCharge(stall);
    expect(w).toMatchObject({ outcome: "stalls", stallV: 5, stallPowerW: (VIN - 5) * 3 });
    if (w.outcome !== "stalls") throw new Error("expected a stall");
    expect(w.reason).toContain("undervoltage lockout");
    expect(3 - 20 / 5).toBeLessThan(0);
    const soa = inrushSoa({ ...stall, ambientC: 85, thermal: { kind: "none", steadyRthKPerW: 40 } });
    expect(soa).toMatchObject({ outcome: "does-not-charge", tjPeakC: 85 + 40 * 57 });
    // Exactly at the boundary (I·Vs = P) the output cannot pass Vs either.
    const edge = inrushCharge({ ...stall, load: { kind: "constant-power", powerW: 15, startV: 5 } });
    expect(edge.outcome).toBe("stalls");
    // A start at 0 V behind a limit: P/V is unbounded at once, a stall at 0 V.
    expect(inrushCharge({ ...stall, load: { kind: "constant-power", powerW: 20, startV: 0 } })).toMatchObject({
      outcome: "stalls",
      stallV: 0,
    });
  });
});

describe("inrush under a slew beside a constant-power load", () => {
  const c: InrushCircuit = { inputV: VIN, capacitanceF: C, load: cp, drive: { kind: "slew", slewVPerS: 1000 } };

  it("loses ½·C·Vin² + (P/s)·[Vin·ln(Vin/Vs) − (Vin − Vs)], by ∫P dt and by conservation of energy", () => {
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    const s = 1000;
    const closed = 0.5 * C * VIN ** 2 + (P / s) * (VIN * Math.log(VIN / VS) - (VIN - VS));
    expect(w.energyJ).toBeCloseTo(closed, 15);
    expect(relativeError(trapezoidJ(c), w.energyJ)).toBeLessThan(1e-6);
    // Source: Vin·∫(C·s + P/V) dt = Vin·C·Vin + Vin·(P/s)·ln(Vin/Vs); capacitor ½·C·Vin²; converter P·(Vin − Vs)/s.
    const source = VIN * C * VIN + VIN * (P / s) * Math.log(VIN / VS);
    const intoLoad = (P * (VIN - VS)) / s;
    expect(relativeError(w.energyJ, source - 0.5 * C * VIN ** 2 - intoLoad)).toBeLessThan(1e-12);
  });

  it("peaks where the converter starts, (Vin − Vs)·(C·s + P/Vs), above the ramp's Vin·C·s; the current at C·s + P/Vs", () => {
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    // (24 − 10)·(1 + 4) = 70 W against 24 W at 0 V.
    expect(w.peakPowerW).toBeCloseTo(70, 12);
    expect(w.peakPowerVdsV).toBe(VIN - VS);
    expect(w.peakCurrentA).toBeCloseTo(5, 12);
    let brute = 0;
    for (let k = 0; k <= 100_000; k += 1) brute = Math.max(brute, w.powerW((k / 100_000) * w.chargeTimeS));
    expect(w.peakPowerW).toBeGreaterThanOrEqual(brute - 1e-9);
    expect(brute).toBeGreaterThan(w.peakPowerW * 0.999);
  });
});

describe("inrush fully on at once beside a constant-power load", () => {
  const [RCH, RLOOP] = [0.05, 0.45];
  const RT = RCH + RLOOP;
  const c: InrushCircuit = {
    inputV: VIN,
    capacitanceF: C,
    load: cp,
    drive: { kind: "uncontrolled", channelOhm: RCH, loopOhm: RLOOP },
  };
  // V1,2 = [Vin ∓ √(Vin² − 4·P·Rt)]/2 = [24 ∓ √(576 − 80)]/2: 0.864 V and 23.136 V.
  const disc = Math.sqrt(VIN ** 2 - 4 * P * RT);
  const [V1, V2] = [(VIN - disc) / 2, (VIN + disc) / 2];

  /** RK4 of C·dV/dt = (Vin − V)/Rt − P/V (V ≥ Vs), with the channel's (I² − I_ss²)·Rch integrated beside it. */
  function rk4(tEnd: number, steps: number, tAt: number) {
    const iss = (VIN - V2) / RT;
    const f = (v: number): [number, number] => {
      const i = (VIN - v) / RT;
      return [(i - (v >= VS ? P / v : 0)) / C, RCH * (i * i - iss * iss)];
    };
    const h = tEnd / steps;
    let [v, e] = [0, 0];
    let vAt = Number.NaN;
    for (let k = 0; k < steps; k += 1) {
      const k1 = f(v);
      const k2 = f(v + 0.5 * h * k1[0]);
      const k3 = f(v + 0.5 * h * k2[0]);
      const k4 = f(v + h * k3[0]);
      v += (h / 6) * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]);
      e += (h / 6) * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]);
      if (Number.isNaN(vAt) && (k + 1) * h >= tAt) vAt = v;
    }
    return { v, e, vAt };
  }

  it("settles at V2, reaches 99 % of it at the closed-form t(V), and loses the closed-form energy above the steady loss", () => {
    const w = inrushCharge(c);
    if (w.outcome !== "charges") throw new Error("expected a charge");
    const t1 = -RT * C * Math.log(1 - VS / VIN);
    const tDone =
      t1 +
      ((RT * C) / (V2 - V1)) * (V1 * Math.log((0.99 * V2 - V1) / (VS - V1)) + V2 * Math.log((V2 - VS) / (0.01 * V2)));
    expect(w.chargeTimeS).toBeCloseTo(tDone, 15);
    const rk = rk4(40 * RT * C, 400_000, w.chargeTimeS);
    expect(rk.v).toBeCloseTo(V2, 6);
    expect(relativeError(rk.vAt, 0.99 * V2)).toBeLessThan(1e-5);
    expect(relativeError(w.energyJ, rk.e)).toBeLessThan(1e-5);
    expect(w.peakCurrentA).toBeCloseTo(VIN / RT, 12);
    // The waveform's V(t) follows the integrated one.
    for (const t of [0.2e-3, 0.5e-3, 1e-3, 2e-3]) expect(w.outputV(t)).toBeCloseTo(rk4(t, 20_000, t).v, 4);
  });

  it("tends to the no-load ½·C·Vin²·Rch/Rt as P → 0; a converter starting below V1 or with no V2 stalls at its start", () => {
    const tiny = inrushCharge({ ...c, load: { ...cp, powerW: 1e-9 } });
    if (tiny.outcome !== "charges") throw new Error("expected a charge");
    expect(relativeError(tiny.energyJ, (0.5 * C * VIN ** 2 * RCH) / RT)).toBeLessThan(1e-6);
    // Below V1 = 0.864 V the loop passes less than P/V: C·dV/dt < 0 at the start, the lockout cycles.
    const low = inrushCharge({ ...c, load: { ...cp, startV: 0.5 } });
    expect(low).toMatchObject({ outcome: "stalls", stallV: 0.5 });
    expect((VIN - 0.5) / RT - P / 0.5).toBeLessThan(0);
    // 4·P·Rt > Vin²: no operating point at all (300 W through 0.5 ohm from 24 V).
    expect(inrushCharge({ ...c, load: { ...cp, powerW: 300 } })).toMatchObject({ outcome: "stalls", stallV: VS });
    expect(inrushCharge({ ...c, load: { ...cp, startV: 0 } })).toMatchObject({ outcome: "stalls", stallV: 0 });
  });
});

describe("inrush beside a constant-power load: no NaN or Infinity over random circuits", () => {
  const drive = fc.oneof(
    fc.record({ kind: fc.constant("slew" as const), slewVPerS: fc.double({ min: 1, max: 1e6, noNaN: true }) }),
    fc.record({ kind: fc.constant("current-limit" as const), limitA: fc.double({ min: 0.01, max: 1e3, noNaN: true }) }),
    fc.record({
      kind: fc.constant("uncontrolled" as const),
      channelOhm: fc.double({ min: 1e-4, max: 1, noNaN: true }),
      loopOhm: fc.double({ min: 0, max: 10, noNaN: true }),
    }),
  );
  it("every outcome's figures are finite, the loss and the charge time positive, the junction finite", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.double({ min: 1e-6, max: 1, noNaN: true }),
        fc.double({ min: 0.01, max: 1e4, noNaN: true }),
        fc.double({ min: 0.001, max: 1.2, noNaN: true }),
        drive,
        (inputV, capacitanceF, powerW, startShare, d) => {
          const c: InrushCircuit = {
            inputV,
            capacitanceF,
            load: { kind: "constant-power", powerW, startV: startShare * inputV },
            drive: d,
          };
          const w = inrushCharge(c);
          if (w.outcome === "stalls") {
            expect(Number.isFinite(w.stallV) && Number.isFinite(w.stallPowerW)).toBe(true);
            return;
          }
          for (const x of [w.chargeTimeS, w.spanS, w.energyJ, w.peakCurrentA, w.peakPowerW, w.peakPowerVdsV])
            expect(Number.isFinite(x)).toBe(true);
          expect(w.chargeTimeS).toBeGreaterThan(0);
          expect(w.energyJ).toBeGreaterThan(0);
          for (const f of [0.1, 0.5, 0.99]) expect(Number.isFinite(w.powerW(f * w.chargeTimeS))).toBe(true);
          const th = { kind: "foster" as const, terms: [{ rKPerW: 2, tauS: 1e-3 }], steadyRthKPerW: 2 };
          const soa = inrushSoa({ ...c, ambientC: 25, thermal: th });
          expect(Number.isFinite(soa.tjPeakC ?? 0)).toBe(true);
        },
      ),
      { numRuns: 1500, seed: 19 },
    );
  });
});
