import { describe, expect, it } from "vitest";
import {
  extremaTimes,
  firstCrossing,
  loopSystem,
  type RlcLoop,
  rateAt,
  shiftSystem,
  stateAt,
  stateIntegral,
} from "../../../domain/physics/rlc-series.js";
import { relativeError } from "../../helpers/tolerance.js";

// The series R-L-C closed form under a source decaying as Vf + ΔV·e^(−t/τ) (issue 19 item 11).
// Outside references: the textbook first-order RC under exponential forcing (L → 0), and an
// independent RK4 integration of the raw circuit with the time-varying source.

// RC = 1 ms, L/R = 1 ps: the RC limit holds to ~1e-9.
const rc: RlcLoop = {
  sourceV: 2,
  loopResistanceOhm: 1,
  inductanceH: 1e-12,
  capacitanceF: 1e-3,
  esrOhm: 0,
  loadCurrentA: 0,
  loadConductanceS: 0,
  sourceDecay: { extraV: 10, tauS: 3e-3 },
};
const RC = 1e-3;
const TAU = 3e-3;
// RC·v' = Vf + ΔV·e^(−t/τ) − v, v(0) = 0: v = Vf + A·e^(−t/τ) + (0 − Vf − A)·e^(−t/RC), A = ΔV·τ/(τ − RC).
const A = (10 * TAU) / (TAU - RC);
const v = (t: number) => 2 + A * Math.exp(-t / TAU) + (-2 - A) * Math.exp(-t / RC);
const vInt = (t: number) => 2 * t + A * TAU * -Math.expm1(-t / TAU) + (-2 - A) * RC * -Math.expm1(-t / RC);

function rk4(p: RlcLoop, x0: readonly [number, number], tEnd: number, steps: number): [number, number] {
  const d = p.sourceDecay ?? { extraV: 0, tauS: 1 };
  const f = (t: number, i: number, vc: number): [number, number] => {
    const vs = p.sourceV + d.extraV * Math.exp(-t / d.tauS);
    return [(vs - p.loopResistanceOhm * i - vc) / p.inductanceH, (i - p.loadCurrentA) / p.capacitanceF];
  };
  const h = tEnd / steps;
  let [i, vc] = x0;
  for (let k = 0; k < steps; k += 1) {
    const t = k * h;
    const k1 = f(t, i, vc);
    const k2 = f(t + h / 2, i + (h / 2) * k1[0], vc + (h / 2) * k1[1]);
    const k3 = f(t + h / 2, i + (h / 2) * k2[0], vc + (h / 2) * k2[1]);
    const k4 = f(t + h, i + h * k3[0], vc + h * k3[1]);
    i += (h / 6) * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]);
    vc += (h / 6) * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]);
  }
  return [i, vc];
}

describe("series R-L-C under an exponentially decaying source", () => {
  const s = loopSystem(rc);
  const x0: [number, number] = [12, 0]; // i(0) = (Vs(0) − v(0))/R: the inductor's current at the RC limit
  it("first order (L → 0): v(t) and ∫v dt are the textbook RC response to Vf + ΔV·e^(−t/τ)", () => {
    for (const t of [1e-4, 1e-3, 3e-3, 1e-2]) {
      expect(Math.abs(stateAt(s, x0, t)[1] - v(t))).toBeLessThan(1e-6);
      expect(Math.abs(stateIntegral(s, x0, t)[1] - vInt(t))).toBeLessThan(1e-8);
    }
  });

  it("the output's maximum, where v' = 0 (textbook: A/τ·e^(−t/τ) = (2 + A)/RC·e^(−t/RC)), is found in closed form", () => {
    const tMax = (Math.log(((2 + A) * TAU) / (A * RC)) * TAU * RC) / (TAU - RC);
    const ext = extremaTimes(s, x0, [0, 1], 0.05, 4);
    expect(ext.length).toBe(1);
    expect(relativeError(ext[0] ?? 0, tMax)).toBeLessThan(1e-6);
    expect(Math.abs(rateAt(s, x0, tMax)[1])).toBeLessThan(1e-6 * (A / TAU));
    // and the level 5 V is crossed where the textbook curve crosses it
    const tc = firstCrossing(s, x0, [0, 1], 5, 0.05) ?? 0;
    expect(Math.abs(v(tc) - 5)).toBeLessThan(1e-6);
  });

  const under: RlcLoop = {
    sourceV: -14,
    loopResistanceOhm: 0.02,
    inductanceH: 1e-6,
    capacitanceF: 100e-6,
    esrOhm: 0,
    loadCurrentA: 1,
    loadConductanceS: 0,
    sourceDecay: { extraV: 20, tauS: 20e-6 },
  };
  it("under-damped (ζ = 0.1): state and first current minimum agree with RK4 of the raw circuit", () => {
    const su = loopSystem(under);
    const x1: [number, number] = [1, 12];
    for (const t of [5e-6, 30e-6, 100e-6, 400e-6]) {
      const ref = rk4(under, x1, t, 40_000);
      const got = stateAt(su, x1, t);
      expect(Math.abs(got[0] - ref[0])).toBeLessThan(1e-6 * 300);
      expect(Math.abs(got[1] - ref[1])).toBeLessThan(1e-6 * 30);
    }
    const [t1, t2] = extremaTimes(su, x1, [1, 0], 1e-3, 2);
    for (const t of [t1 ?? 0, t2 ?? 0]) expect(Math.abs(rateAt(su, x1, t)[0])).toBeLessThan(1e-6 * 3e7);
    // a scan on a fine grid finds no lower current before the first extremum's
    let low = Number.POSITIVE_INFINITY;
    for (let k = 0; k <= 20_000; k += 1) low = Math.min(low, stateAt(su, x1, (k * (t2 ?? 0)) / 20_000)[0]);
    expect(Math.min(stateAt(su, x1, t1 ?? 0)[0], stateAt(su, x1, t2 ?? 0)[0])).toBeLessThanOrEqual(low + 1e-9);
  });

  it("a phase started later takes the decayed forcing: x(t0 + t) from x(t0) equals x(t0 + t) from 0", () => {
    const su = loopSystem(under);
    const x1: [number, number] = [1, 12];
    const t0 = 17e-6;
    const a = stateAt(shiftSystem(su, t0), stateAt(su, x1, t0), 40e-6);
    const b = stateAt(su, x1, t0 + 40e-6);
    expect(Math.abs(a[0] - b[0])).toBeLessThan(1e-9);
    expect(Math.abs(a[1] - b[1])).toBeLessThan(1e-9);
  });

  it("at resonance (τ equal to an over-damped loop's mode) the answer is continuous with τ nearby", () => {
    const { sourceDecay: _decay, ...steady } = under;
    const over: RlcLoop = { ...steady, loopResistanceOhm: 1.5 };
    const sv = loopSystem(over);
    const m = (sv.a11 + sv.a22) / 2;
    const slow = (sv.a11 * sv.a22 - sv.a12 * sv.a21) / (m - Math.sqrt(m * m - (sv.a11 * sv.a22 - sv.a12 * sv.a21)));
    const at = (tau: number) =>
      stateAt(loopSystem({ ...over, sourceDecay: { extraV: 20, tauS: tau } }), [1, 12], 200e-6);
    const r = at(-1 / slow);
    const n = at((-1 / slow) * (1 + 1e-4));
    expect(Number.isFinite(r[1])).toBe(true);
    expect(Math.abs(r[1] - n[1])).toBeLessThan(1e-3);
    expect(Math.abs(r[0] - n[0])).toBeLessThan(1e-3);
  });
});
