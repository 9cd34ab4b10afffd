import { describe, expect, it } from "vitest";
import { type CauerStage, cauerToFoster } from "../../domain/physics/cauer.js";
import {
  type FosterTerm,
  type PowerPulse,
  periodicTrainRiseK,
  pulseTrainRiseK,
  steadyRthKPerW,
  zthKPerW,
} from "../../domain/physics/foster.js";
import { runNgspice } from "../helpers/ngspice.js";

// Thermal networks as electrical ones (temperature ↔ voltage, power ↔ current, K/W ↔ ohm,
// J/K ↔ farad): ngspice solves the same RC circuits independently (docs/references.md,
// "General-purpose oracle"). The closed forms are named beside each check.

/** Netlist of a Foster chain (parallel R‖C blocks in series) or a Cauer ladder driven by a current source. */
function fosterNet(net: readonly FosterTerm[]): string {
  return net
    .map((t, i) => `R${i} n${i} n${i + 1} ${t.rKPerW}\nC${i} n${i} n${i + 1} ${t.tauS / t.rKPerW}`)
    .join("\n")
    .replace(new RegExp(`n${net.length}\\b`, "g"), "0");
}
function cauerNet(ladder: readonly CauerStage[]): string {
  return ladder
    .map((s, i) => `C${i} n${i} 0 ${s.cJPerK}\nR${i} n${i} ${i + 1 === ladder.length ? "0" : `n${i + 1}`} ${s.rKPerW}`)
    .join("\n");
}
function spice(body: string, source: string, stopS: number, stepS: number): number[][] {
  return runNgspice(
    `* thermal network\nI1 0 n0 ${source}\n${body}\n.tran ${stepS} ${stopS} 0 ${stepS} uic\n.control\nrun\nwrdata out.txt v(n0)\nquit\n.endc\n.end\n`,
  );
}
/** ngspice's node-0 voltage at time t (linear between its output rows). */
function at(rows: number[][], t: number): number {
  let k = rows.findIndex((r) => (r[0] ?? 0) >= t);
  if (k <= 0) k = 1;
  const [t0, v0] = rows[k - 1] as [number, number];
  const [t1, v1] = rows[k] as [number, number];
  return v0 + ((v1 - v0) * (t - t0)) / (t1 - t0 || 1);
}

const ladder: CauerStage[] = [
  { rKPerW: 0.2, cJPerK: 0.002 },
  { rKPerW: 0.8, cJPerK: 0.05 },
  { rKPerW: 3, cJPerK: 1.2 },
];

describe("a Cauer ladder as its Foster network", () => {
  const foster = cauerToFoster(ladder);
  it("keeps the steady resistance (ΣRi = ΣR of the ladder: conservation at t → ∞)", () => {
    expect(steadyRthKPerW(foster)).toBeCloseTo(4, 9);
  });
  it("gives the ladder's step response: within 0.5 % of ngspice from 1 ms to 20 s", () => {
    const rows = spice(cauerNet(ladder), "DC 1", 20, 5e-3);
    for (const t of [1e-3, 1e-2, 0.1, 1, 5, 20]) {
      const z = zthKPerW(foster, t);
      expect(Math.abs(z / at(rows, t) - 1), `t = ${t} s`).toBeLessThan(5e-3);
    }
  });
  it("a single stage is R with τ = R·C (closed form)", () => {
    expect(cauerToFoster([{ rKPerW: 2, cJPerK: 3 }])).toEqual([{ rKPerW: 2, tauS: 6 }]);
  });
});

describe("a periodic pulse train through a Foster network", () => {
  const net: FosterTerm[] = [
    { rKPerW: 0.5, tauS: 1e-3 },
    { rKPerW: 2, tauS: 0.05 },
    { rKPerW: 10, tauS: 2 },
  ];
  const train = { powerW: 20, widthS: 0.01, periodS: 0.1, count: 30 };

  it("single stage: the periodic steady state is R·P·(1 − e^(−tp/τ))/(1 − e^(−T/τ)) (textbook closed form)", () => {
    const r = 3;
    const tau = 0.2;
    const out = periodicTrainRiseK([{ rKPerW: r, tauS: tau }], { ...train, count: 10_000 });
    const closed = (r * train.powerW * (1 - Math.exp(-train.widthS / tau))) / (1 - Math.exp(-train.periodS / tau));
    expect(out.steadyPeakK).toBeCloseTo(closed, 9);
    expect(out.lastPeakK).toBeCloseTo(closed, 9);
    expect(out.steadyValleyK).toBeCloseTo(closed * Math.exp(-(train.periodS - train.widthS) / tau), 9);
  });

  it("equals the superposition of its pulses' step responses at the end of the last pulse", () => {
    const pulses: PowerPulse[] = Array.from({ length: train.count }, (_, k) => ({
      startS: k * train.periodS,
      endS: k * train.periodS + train.widthS,
      powerW: train.powerW,
    }));
    const tEnd = (train.count - 1) * train.periodS + train.widthS;
    expect(periodicTrainRiseK(net, train).lastPeakK).toBeCloseTo(pulseTrainRiseK(net, pulses, tEnd), 9);
  });

  it("matches ngspice on the same Foster chain driven by a pulsed current (within 1 %)", () => {
    const source = `PULSE(0 ${train.powerW} 0 1n 1n ${train.widthS - 2e-9} ${train.periodS} ${train.count})`;
    const rows = spice(fosterNet(net), source, train.count * train.periodS, 1e-4);
    const tEnd = (train.count - 1) * train.periodS + train.widthS;
    const spiceMax = Math.max(...rows.filter((r) => (r[0] ?? 0) <= tEnd + 1e-4).map((r) => r[1] ?? 0));
    expect(Math.abs(periodicTrainRiseK(net, train).lastPeakK / spiceMax - 1)).toBeLessThan(0.01);
  });

  it("a single pulse is the network's Zth at its width; the steady peak bounds every finite train", () => {
    const one = periodicTrainRiseK(net, { ...train, count: 1 });
    expect(one.lastPeakK).toBeCloseTo(train.powerW * zthKPerW(net, train.widthS), 9);
    const many = periodicTrainRiseK(net, train);
    expect(many.lastPeakK).toBeGreaterThan(one.lastPeakK);
    expect(many.lastPeakK).toBeLessThanOrEqual(many.steadyPeakK);
    // Duty-cycle average: the steady mean rise is P·(tp/T)·ΣR, between the valley and the peak.
    const mean = train.powerW * (train.widthS / train.periodS) * steadyRthKPerW(net);
    expect(many.steadyValleyK).toBeLessThan(mean);
    expect(many.steadyPeakK).toBeGreaterThan(mean);
  });
});

describe("a junction-case Foster network cascaded with the case-to-ambient path", () => {
  // The physical cascade: the junction-case Cauer ladder, then a heatsink node (Rca, Cca).
  // The approximation the service uses for a junction-case Foster network: its terms plus one
  // term (Rca, τ = Rca·Cca) in series. A Foster chain passes the whole power to its far end at
  // once, so the heatsink heats earlier than in the ladder: the sum is an upper bound.
  const sink: CauerStage = { rKPerW: 6, cJPerK: 8 };
  const approx = [...cauerToFoster(ladder), { rKPerW: sink.rKPerW, tauS: sink.rKPerW * sink.cJPerK }];
  const exact = cauerToFoster([...ladder, sink]);
  const rows = spice(cauerNet([...ladder, sink]), "DC 1", 400, 0.1);
  it("the exact cascade (ladder + heatsink stage) matches ngspice within 0.5 %", () => {
    for (const t of [1e-2, 0.1, 1, 10, 100, 400])
      expect(Math.abs(zthKPerW(exact, t) / at(rows, t) - 1), `t = ${t} s`).toBeLessThan(5e-3);
  });
  it("the series sum is never below it, and both reach ΣR", () => {
    let worst = 0;
    for (const t of [1e-3, 1e-2, 0.1, 0.3, 1, 3, 11, 30, 100, 1000]) {
      const z = zthKPerW(exact, t);
      expect(zthKPerW(approx, t), `t = ${t} s`).toBeGreaterThanOrEqual(z * (1 - 1e-9));
      worst = Math.max(worst, zthKPerW(approx, t) / z - 1);
    }
    expect(steadyRthKPerW(approx)).toBeCloseTo(steadyRthKPerW(exact), 9);
    // Measured error of the approximation on this network: 17.5 % above the ladder near t = 11 s.
    expect(worst).toBeGreaterThan(0.1);
    expect(worst).toBeLessThan(0.2);
  });
});
