import { describe, expect, it } from "vitest";
import { thermalVoltageV } from "../../../domain/physics/constants.js";
import { type OringModel, type OringSource, solveOring } from "../../../domain/solve/oring-network.js";
import type { StageModel } from "../../../domain/stages/stage-model.js";
import { relativeError } from "../../helpers/tolerance.js";
import { idealDiodeStage, pfetStage, schottkyDiode, schottkyStage } from "../../fixtures/reverse-stages.js";

const isothermal = (s: StageModel): StageModel => ({ ...s, thermal: { kind: "junction-ambient", rthJaKPerW: 0 } });
const src = (v: number, stage: StageModel, r = 0.05): OringSource => ({
  openCircuitV: v,
  internalResistanceOhm: r,
  stage,
});

/**
 * Independent oracle: bisection on the node voltage, each branch current by bisection on the
 * Shockley equation with series resistance, V = n·Vt·ln(1 + I/Is) + I·Rs (25 °C, Is at TNOM).
 */
function bisectDiodeNode(vocs: number[], r: number, loadA: number): { v: number; currents: number[] } {
  const d = schottkyDiode;
  const nvt = d.ideality * thermalVoltageV(298.15);
  const branch = (voc: number, vn: number): number => {
    if (vn >= voc) return 0;
    let lo = 0;
    let hi = (voc - vn) / r;
    for (let k = 0; k < 200; k += 1) {
      const i = 0.5 * (lo + hi);
      const g = voc - vn - i * r - (nvt * Math.log1p(i / d.saturationCurrentA) + i * d.seriesResistanceOhm);
      if (g > 0) lo = i;
      else hi = i;
    }
    return 0.5 * (lo + hi);
  };
  let lo = 0;
  let hi = Math.max(...vocs);
  for (let k = 0; k < 200; k += 1) {
    const v = 0.5 * (lo + hi);
    const f = vocs.reduce((s, voc) => s + branch(voc, v), 0) - loadA;
    if (f > 0) lo = v;
    else hi = v;
  }
  const v = 0.5 * (lo + hi);
  return { v, currents: vocs.map((voc) => branch(voc, v)) };
}

describe("ORing network", () => {
  const configs: [string, OringModel][] = [
    [
      "two Schottky, CC load",
      {
        sources: [src(12.3, schottkyStage), src(12, schottkyStage)],
        load: { kind: "constant-current", currentA: 5 },
        ambientC: 40,
      },
    ],
    [
      "ideal diode + P-FET, resistive",
      {
        sources: [src(12.2, idealDiodeStage), src(12, pfetStage)],
        load: { kind: "resistive", resistanceOhm: 3 },
        ambientC: 25,
      },
    ],
    [
      "three mixed, constant power",
      {
        sources: [src(48, idealDiodeStage, 0.1), src(47.5, schottkyStage, 0.1), src(47, pfetStage, 0.2)],
        load: { kind: "constant-power", powerW: 400, minVoltageV: 36 },
        ambientC: 50,
      },
    ],
  ];
  // Source: Kirchhoff's current law at the node, 1e-9 relative to the load current.
  it.each(configs)("%s: KCL holds at the node", (_n, m) => {
    const r = solveOring(m);
    if (r.outcome !== "solved") throw new Error(r.outcome);
    expect(Math.abs(r.kclResidualA)).toBeLessThan(1e-9 * r.loadCurrentA);
  });

  // Source: symmetry: identical sources and stages carry equal currents (electrothermal too).
  it("identical sources split equally", () => {
    const r = solveOring({
      sources: [src(24, schottkyStage), src(24, schottkyStage), src(24, schottkyStage)],
      load: { kind: "constant-current", currentA: 6 },
      ambientC: 25,
    });
    if (r.outcome !== "solved") throw new Error(r.outcome);
    for (const b of r.branches) expect(relativeError(b.currentA, 2)).toBeLessThan(1e-9);
    expect(r.branches[0]?.tjC).toBeGreaterThan(25);
  });

  // Source: independent nested bisection with the diode equation (see bisectDiodeNode).
  it("0.3 V apart through diodes: currents match the bisection; the lower source still conducts", () => {
    const m: OringModel = {
      sources: [src(12.3, isothermal(schottkyStage)), src(12, isothermal(schottkyStage))],
      load: { kind: "constant-current", currentA: 3 },
      ambientC: 25,
    };
    const r = solveOring(m);
    if (r.outcome !== "solved") throw new Error(r.outcome);
    const ref = bisectDiodeNode([12.3, 12], 0.05, 3);
    expect(Math.abs(r.nodeV - ref.v)).toBeLessThan(1e-9);
    r.branches.forEach((b, k) => {
      expect(relativeError(b.currentA, ref.currents[k] ?? 0)).toBeLessThan(1e-6);
    });
    expect(r.branches[1]?.currentA).toBeGreaterThan(0);
    const shares = [0.1, 0.3, 0.5].map((dv) => {
      const s = solveOring({
        ...m,
        sources: [src(12 + dv, isothermal(schottkyStage)), src(12, isothermal(schottkyStage))],
      });
      return s.outcome === "solved" ? (s.branches[1]?.share ?? 1) : 1;
    });
    expect(shares[0]).toBeGreaterThan(shares[1] ?? 1);
    expect(shares[1]).toBeGreaterThan(shares[2] ?? 1);
  });

  it("a lower source behind a P-FET takes reverse current; behind a diode it only leaks", () => {
    const load = { kind: "constant-current", currentA: 2 } as const;
    const p = solveOring({ sources: [src(12.5, idealDiodeStage), src(11, pfetStage)], load, ambientC: 25 });
    const d = solveOring({ sources: [src(12.5, idealDiodeStage), src(11, schottkyStage)], load, ambientC: 25 });
    if (p.outcome !== "solved" || d.outcome !== "solved") throw new Error("unsolved");
    expect(p.branches[1]?.mode).toBe("reverse-channel");
    expect(p.branches[1]?.blocks).toBe(false);
    expect(p.branches[1]?.currentA).toBeLessThan(-1);
    expect(d.branches[1]?.mode).toBe("reverse-junction-leakage");
    expect(d.branches[1]?.blocks).toBe(true);
    expect(Math.abs(d.branches[1]?.currentA ?? 1)).toBeLessThan(1e-3);
  });

  it("no sources is reported, not crashed", () => {
    expect(solveOring({ sources: [], load: { kind: "resistive", resistanceOhm: 1 }, ambientC: 25 }).outcome).toBe(
      "no-sources",
    );
  });
});
