import type { BridgeAcModel } from "../../domain/checks/bridge-ac.js";
import type { DiodeParams } from "../../domain/physics/diode.js";
import type { AcSourceAndFilter } from "../../domain/solve/ac-bridge-circuit.js";

/** A diode bridge or a switch-based active bridge, as ngspice sees it (all at one temperature). */
export interface SpiceBridge extends Omit<AcSourceAndFilter, "load"> {
  readonly loadOhm: number;
  /** Diode of a diode bridge, or the body diode of an active element. */
  readonly diode: DiodeParams;
  /** Channel of an active element: a switch of this on-resistance in parallel with the body diode. */
  readonly switchOnOhm?: number;
  readonly tempC: number;
  /** Periods simulated from a discharged capacitor; the last one is measured. */
  readonly periods: number;
  /** Largest internal time step as a fraction of the period. */
  readonly maxStepFraction: number;
}

/** The oracle's view of an AC bridge model with a resistive load (25 °C, steps of T/2000). */
export function spiceBridgeOf(
  m: BridgeAcModel,
  diode: DiodeParams,
  periods: number,
  switchOnOhm?: number,
): SpiceBridge {
  if (m.load.kind !== "resistive") throw new Error("the oracle netlist has a resistive load");
  return {
    sourceRmsV: m.sourceRmsV,
    frequencyHz: m.frequencyHz,
    sourceResistanceOhm: m.sourceResistanceOhm,
    leakageInductanceH: m.leakageInductanceH,
    capacitanceF: m.capacitanceF,
    esrOhm: m.esrOhm,
    loadOhm: m.load.resistanceOhm,
    diode,
    ...(switchOnOhm === undefined ? {} : { switchOnOhm }),
    tempC: 25,
    periods,
    maxStepFraction: 1 / 2000,
  };
}

export interface SpiceBridgeResult {
  readonly dcOutputV: number;
  readonly rippleVpp: number;
  /** RMS current and loss of each element: line1High, line2High, line1Low, line2Low. */
  readonly elementRmsA: readonly number[];
  readonly elementLossW: readonly number[];
  readonly elementAverageA: readonly number[];
  /** Largest forward current of each element over ngspice's own time points, A. */
  readonly elementPeakA: readonly number[];
  readonly capacitorRmsA: number;
  readonly sourceRmsA: number;
}

/**
 * Netlist of the bridge. A zero-volt source in series with each element measures its current;
 * its loss is the element voltage times that current. An active element is a voltage-controlled
 * switch driven by its own forward voltage (on above 1 mV, off below 0 V: an ideal diode with
 * on-resistance RON) in parallel with the body diode. The floating source is tied to ground by
 * 10 MΩ per line so the matrix is solvable (30 V / 10 MΩ = 3 µA, below the resolution of the checks) (docs/references.md, general-purpose oracle).
 */
export function bridgeNetlist(b: SpiceBridge): string {
  const d = b.diode;
  const period = 1 / b.frequencyHz;
  const tStop = b.periods * period;
  const tMax = b.maxStepFraction * period;
  const elements: [string, string, string][] = [
    ["1", "l1", "out"],
    ["2", "l2", "out"],
    ["3", "0", "l1"],
    ["4", "0", "l2"],
  ];
  const lines = [
    "* full bridge with reservoir capacitor",
    `.options temp=${b.tempC} tnom=${d.nominalTempK - 273.15} reltol=1e-5 abstol=1e-9 vntol=1e-7 method=gear maxord=2`,
    `V1 a l2 SIN(0 ${Math.SQRT2 * b.sourceRmsV} ${b.frequencyHz} 0 0 0)`,
    b.leakageInductanceH > 0 ? `L1 a m ${b.leakageInductanceH}` : "Vm a m 0",
    `Rs m l1 ${Math.max(b.sourceResistanceOhm, 1e-9)}`,
    "Rg1 l1 0 1e7",
    "Rg2 l2 0 1e7",
    `C1 out c ${b.capacitanceF}`,
    `Resr c 0 ${Math.max(b.esrOhm, 1e-9)}`,
    `RL out 0 ${b.loadOhm}`,
    `.model dmod D(IS=${d.saturationCurrentA} N=${d.ideality} RS=${d.seriesResistanceOhm} EG=${d.energyGapEv} XTI=${d.saturationTempExponent})`,
  ];
  for (const [k, anode, cathode] of elements) {
    lines.push(`Vd${k} ${anode} x${k} 0`, `D${k} x${k} ${cathode} dmod`);
    if (b.switchOnOhm !== undefined) lines.push(`S${k} x${k} ${cathode} x${k} ${cathode} swmod`);
  }
  if (b.switchOnOhm !== undefined) lines.push(`.model swmod SW(VT=0.5m VH=0.5m RON=${b.switchOnOhm} ROFF=1e9)`);
  lines.push(
    `.tran ${tMax} ${tStop} ${tStop - period} ${tMax} uic`,
    ".control",
    "run",
    "wrdata out.txt v(out) i(vd1) i(vd2) i(vd3) i(vd4) v(l1) v(l2) i(v1)",
    "quit",
    ".endc",
    ".end",
  );
  return `${lines.join("\n")}\n`;
}

/** Period averages over ngspice's own time points by the trapezoidal rule. */
export function reduceBridgeRows(rows: readonly number[][], b: SpiceBridge): SpiceBridgeResult {
  // wrdata writes "time value" pairs per vector.
  const col = (r: readonly number[], k: number): number => r[2 * k + 1] ?? Number.NaN;
  const t = rows.map((r) => r[0] ?? Number.NaN);
  const t0 = t[0] ?? 0;
  const tn = t[t.length - 1] ?? 0;
  const span = tn - t0;
  const integrate = (g: (r: readonly number[]) => number): number => {
    let s = 0;
    for (let k = 1; k < rows.length; k += 1) {
      const a = rows[k - 1];
      const c = rows[k];
      if (a === undefined || c === undefined) continue;
      s += 0.5 * ((t[k] ?? 0) - (t[k - 1] ?? 0)) * (g(a) + g(c));
    }
    return s / span;
  };
  const vOut = (r: readonly number[]) => col(r, 0);
  const vl1 = (r: readonly number[]) => col(r, 5);
  const vl2 = (r: readonly number[]) => col(r, 6);
  const elementV = [
    (r: readonly number[]) => vl1(r) - vOut(r),
    (r: readonly number[]) => vl2(r) - vOut(r),
    (r: readonly number[]) => -vl1(r),
    (r: readonly number[]) => -vl2(r),
  ];
  const outs = rows.map(vOut);
  const capA = (r: readonly number[]) => col(r, 1) + col(r, 2) - col(r, 3) - col(r, 4) - vOut(r) / b.loadOhm;
  void capA;
  return {
    dcOutputV: integrate(vOut),
    rippleVpp: Math.max(...outs) - Math.min(...outs),
    elementRmsA: [1, 2, 3, 4].map((k) => Math.sqrt(integrate((r) => col(r, k) ** 2))),
    elementAverageA: [1, 2, 3, 4].map((k) => integrate((r) => col(r, k))),
    elementPeakA: [1, 2, 3, 4].map((k) => Math.max(...rows.map((r) => col(r, k)))),
    elementLossW: [1, 2, 3, 4].map((k) => integrate((r) => (elementV[k - 1]?.(r) ?? 0) * col(r, k))),
    capacitorRmsA: Math.sqrt(integrate((r) => (col(r, 1) + col(r, 2) - vOut(r) / b.loadOhm) ** 2)),
    sourceRmsA: Math.sqrt(integrate((r) => col(r, 7) ** 2)),
  };
}
