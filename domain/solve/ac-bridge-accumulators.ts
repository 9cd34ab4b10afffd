import type { AcBridgeCircuit, Snapshot } from "./ac-bridge-circuit.js";
import { QUAD_W0, QUAD_W1, QUAD_WG } from "./tr-bdf2.js";

/**
 * The running integrals of one period of the AC bridge (ac-bridge-period.ts): energies, charges,
 * I²·t and extremes, summed over each step's three quadrature nodes (TR-BDF2's own weights), per
 * element and for the source, the capacitor and the load.
 */
export interface Acc {
  sourceEnergyJ: number;
  lineA2s: number;
  sourceResistanceEnergyJ: number;
  inductorEnergyJ: number;
  esrEnergyJ: number;
  capEnergyJ: number;
  capA2s: number;
  loadEnergyJ: number;
  loadAs: number;
  outVs: number;
  elementAs: number[];
  elementA2s: number[];
  elementEnergyJ: number[];
  elementPeakA: number[];
  elementMaxReverseV: number[];
  outMinV: number;
  outMaxV: number;
  lineMaxA: number;
}

export function newAccumulators(): Acc {
  return {
    sourceEnergyJ: 0,
    lineA2s: 0,
    sourceResistanceEnergyJ: 0,
    inductorEnergyJ: 0,
    esrEnergyJ: 0,
    capEnergyJ: 0,
    capA2s: 0,
    loadEnergyJ: 0,
    loadAs: 0,
    outVs: 0,
    elementAs: [0, 0, 0, 0],
    elementA2s: [0, 0, 0, 0],
    elementEnergyJ: [0, 0, 0, 0],
    elementPeakA: [0, 0, 0, 0],
    elementMaxReverseV: [0, 0, 0, 0],
    outMinV: Number.POSITIVE_INFINITY,
    outMaxV: Number.NEGATIVE_INFINITY,
    lineMaxA: 0,
  };
}

export function accumulate(acc: Acc, c: AcBridgeCircuit, s0: Snapshot, sg: Snapshot, s1: Snapshot, h: number): void {
  const loadAs = acc.loadAs;
  accumulateNode(acc, c, s0, QUAD_W0 * h);
  accumulateNode(acc, c, sg, QUAD_WG * h);
  accumulateNode(acc, c, s1, QUAD_W1 * h);
  // Without inductance the line current is C·d(capV)/dt plus the load current (Kirchhoff at the
  // output), and the step's charge through the conducting pair is C·Δ(capV) plus the load's
  // charge: exact for the step's own update (TR-BDF2 advances capV by h·Σ w·capA/C), where the
  // quadrature of the algebraic current is one order less accurate and straddles the edges of
  // conduction. The elements' averages then equal the load's to the periodicity residual.
  if (c.leakageInductanceH > 0) return;
  const pair = s0.pair !== 0 ? s0.pair : sg.pair !== 0 ? sg.pair : s1.pair;
  if (pair === 0) return;
  const base = pair > 0 ? 0 : 2;
  const charge = c.capacitanceF * (s1.capV - s0.capV) + (acc.loadAs - loadAs);
  const quad =
    QUAD_W0 * h * (s0.pair === pair ? Math.abs(s0.lineA) : 0) +
    QUAD_WG * h * (sg.pair === pair ? Math.abs(sg.lineA) : 0) +
    QUAD_W1 * h * (s1.pair === pair ? Math.abs(s1.lineA) : 0);
  acc.elementAs[base] = (acc.elementAs[base] ?? 0) + charge - quad;
  acc.elementAs[base + 1] = (acc.elementAs[base + 1] ?? 0) + charge - quad;
}

/** One quadrature node of weight w (plain scalar updates: this runs three times per step). */
function accumulateNode(acc: Acc, c: AcBridgeCircuit, s: Snapshot, w: number): void {
  const i = s.lineA;
  const mag = Math.abs(i);
  acc.sourceEnergyJ += w * s.sourceV * i;
  acc.lineA2s += w * i * i;
  acc.sourceResistanceEnergyJ += w * c.sourceResistanceOhm * i * i;
  acc.inductorEnergyJ += w * s.inductorV * i;
  acc.esrEnergyJ += w * c.esrOhm * s.capA * s.capA;
  acc.capEnergyJ += w * s.capV * s.capA;
  acc.capA2s += w * s.capA * s.capA;
  acc.loadEnergyJ += w * s.outV * s.loadA;
  acc.loadAs += w * s.loadA;
  acc.outVs += w * s.outV;
  if (s.outV < acc.outMinV) acc.outMinV = s.outV;
  if (s.outV > acc.outMaxV) acc.outMaxV = s.outV;
  if (mag > acc.lineMaxA) acc.lineMaxA = mag;
  if (s.pair !== 0) {
    const base = s.pair > 0 ? 0 : 2;
    addElement(acc, base, w, mag, s.dropAV);
    addElement(acc, base + 1, w, mag, s.dropBV);
    // Blocking elements: the output plus the drop of the conducting element on their line
    // (line1Low ↔ line1High, line2High ↔ line2Low; see bridge-element.ts REVERSE_PARTNER).
    const other = s.pair > 0 ? 2 : 0;
    raiseReverse(acc, other, s.outV + s.dropBV);
    raiseReverse(acc, other + 1, s.outV + s.dropAV);
  } else {
    for (let k = 0; k < 4; k += 1) raiseReverse(acc, k, s.outV);
  }
}

function addElement(acc: Acc, slot: number, w: number, mag: number, dropV: number): void {
  acc.elementAs[slot] = (acc.elementAs[slot] ?? 0) + w * mag;
  acc.elementA2s[slot] = (acc.elementA2s[slot] ?? 0) + w * mag * mag;
  acc.elementEnergyJ[slot] = (acc.elementEnergyJ[slot] ?? 0) + w * dropV * mag;
  if (mag > (acc.elementPeakA[slot] ?? 0)) acc.elementPeakA[slot] = mag;
}

export function raiseReverse(acc: Acc, slot: number, v: number): void {
  if (v > (acc.elementMaxReverseV[slot] ?? 0)) acc.elementMaxReverseV[slot] = v;
}
