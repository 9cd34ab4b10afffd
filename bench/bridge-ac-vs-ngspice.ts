/**
 * Side-by-side benchmark: the AC bridge's periodic steady state (shooting + TR-BDF2) against an
 * ngspice 39 transient on the same circuit, run from a discharged capacitor until it reaches
 * steady state. Both at 25 °C (ngspice is isothermal). Times are CPU time (user + system; the
 * machine may be shared), medians of repeated runs. Prints both times, the ratio and the
 * difference in results, and writes bench/out/bridge-ac-vs-ngspice.json.
 *
 *   npm run bench:bridge
 */
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { type BridgeAcModel, solveBridgeAcAt, steadyStateOf } from "../domain/checks/bridge-ac.js";
import type { BridgeElements } from "../domain/checks/bridge-element.js";
import { activeElement, demoPn, diodeElement, uniform } from "../test/helpers/bridge-parts.js";
import { bridgeNetlist, reduceBridgeRows, type SpiceBridge, spiceBridgeOf } from "../test/helpers/bridge-spice.js";

const T25 = 298.15;
const temps = { line1High: T25, line2High: T25, line1Low: T25, line2Low: T25 };

function model(elements: BridgeElements, leakageInductanceH: number): BridgeAcModel {
  return { elements, sourceRmsV: 24, frequencyHz: 50, sourceResistanceOhm: 0.5, leakageInductanceH, capacitanceF: 2200e-6, esrOhm: 0.05, load: { kind: "resistive", resistanceOhm: 20 }, ambientC: 25 };
}

function spice(m: BridgeAcModel, periods: number, switchOnOhm?: number): SpiceBridge {
  return spiceBridgeOf(m, demoPn, periods, switchOnOhm);
}

/** ngspice in batch mode in a scratch folder; returns the rows and the wall time of the process. */
function timedNgspice(netlist: string): { rows: number[][]; ms: number } {
  const dir = mkdtempSync(join(tmpdir(), "backstop-bench-"));
  try {
    writeFileSync(join(dir, ".spiceinit"), "");
    writeFileSync(join(dir, "circuit.cir"), netlist);
    // CPU time (user + system) of the ngspice child, from bash's `times` (robust to a busy machine).
    const out = execFileSync("bash", ["-c", "ngspice -b circuit.cir >/dev/null 2>&1; times"], { cwd: dir, encoding: "utf8", timeout: 300_000 });
    const child = out.trim().split("\n")[1] ?? "";
    const ms = [...child.matchAll(/(\d+)m([\d.]+)s/g)].reduce((sum, m) => sum + (Number(m[1]) * 60 + Number(m[2])) * 1000, 0);
    const rows = readFileSync(join(dir, "out.txt"), "utf8").trim().split("\n").map((l) => l.trim().split(/\s+/).map(Number));
    return { rows, ms };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The first period count after which the period-average output changes by < 1e-4 relative (0.01 %, far inside the 1 % the comparison needs). */
function periodsToSteadyState(m: BridgeAcModel, sw: number | undefined): number {
  const b = { ...spice(m, 60, sw) };
  // Full record from t = 0: tstart 0 (record every period).
  const net = bridgeNetlist(b).replace(/\.tran (\S+) (\S+) \S+ (\S+) uic/, ".tran $1 $2 0 $3 uic");
  const { rows } = timedNgspice(net);
  const period = 1 / m.frequencyHz;
  const avg: number[] = [];
  for (let k = 0; k < 60; k += 1) {
    const seg = rows.filter((r) => (r[0] ?? 0) >= k * period && (r[0] ?? 0) < (k + 1) * period);
    avg.push(seg.reduce((s, r) => s + (r[1] ?? 0), 0) / Math.max(seg.length, 1));
  }
  for (let k = 1; k < avg.length; k += 1) {
    const settled = avg.slice(k).every((v, j) => Math.abs(v - (avg[k + j - 1] ?? v)) < 1e-4 * Math.abs(v));
    if (settled) return k + 1;
  }
  return 60;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] ?? Number.NaN;
}

const cases = [
  { name: "diode bridge", elements: uniform(diodeElement()), sw: undefined, l: 0 },
  { name: "diode bridge, 2 mH leakage", elements: uniform(diodeElement()), sw: undefined, l: 2e-3 },
  { name: "active bridge (switch 20 mΩ + body diode)", elements: uniform(activeElement({ rdsOnOhm: 0.02 })), sw: 0.02, l: 0 },
];

const results = [];
for (const c of cases) {
  const m = model(c.elements, c.l);
  const periods = periodsToSteadyState(m, c.sw);
  const spiceRuns = [0, 1, 2].map(() => timedNgspice(bridgeNetlist(spice(m, periods, c.sw))));
  const spiceMs = median(spiceRuns.map((r) => r.ms));
  const startup = median([0, 1, 2].map(() => timedNgspice(bridgeNetlist(spice(m, 1, c.sw))).ms));
  const ref = reduceBridgeRows(spiceRuns[0]?.rows ?? [], spice(m, periods, c.sw));
  for (let k = 0; k < 5; k += 1) solveBridgeAcAt(m, temps); // JIT warm-up
  const times: number[] = [];
  let ours: ReturnType<typeof steadyStateOf> | undefined;
  let oursPeriods = 0;
  for (let k = 0; k < 15; k += 1) {
    const t = process.cpuUsage();
    const iso = solveBridgeAcAt(m, temps);
    if (!iso.ok) throw new Error(iso.reason);
    ours = steadyStateOf(m, iso, temps, { thermalIterations: 0, periods: iso.periods });
    const d = process.cpuUsage(t);
    times.push((d.user + d.system) / 1000);
    oursPeriods = iso.periods;
  }
  if (ours === undefined) throw new Error("no run");
  const oursMs = median(times);
  const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
  const order = ["line1High", "line2High", "line1Low", "line2Low"] as const;
  const el = (p: (typeof order)[number]) => ours?.elements.find((e) => e.position === p);
  const row = {
    case: c.name,
    ngspicePeriodsToSteadyState: periods,
    ngspiceMs: Number(spiceMs.toFixed(1)),
    ngspiceOneTinyRunMs: Number(startup.toFixed(1)),
    oursMs: Number(oursMs.toFixed(2)),
    oursPeriodsIntegrated: oursPeriods,
    ratio: Number((spiceMs / oursMs).toFixed(0)),
    ratioNetOfStartup: Number(((spiceMs - startup) / oursMs).toFixed(0)),
    dcOutputV: { ours: ours.dcOutputV, ngspice: ref.dcOutputV, rel: rel(ours.dcOutputV, ref.dcOutputV) },
    rippleVpp: { ours: ours.rippleVpp, ngspice: ref.rippleVpp, rel: rel(ours.rippleVpp, ref.rippleVpp) },
    maxRelElementRms: Math.max(...order.map((p, k) => rel(el(p)?.rmsCurrentA ?? 0, ref.elementRmsA[k] ?? 1))),
    maxRelElementLoss: Math.max(...order.map((p, k) => rel(el(p)?.lossW ?? 0, ref.elementLossW[k] ?? 1))),
    capacitorRms: { ours: ours.capacitorRippleCurrentRmsA, ngspice: ref.capacitorRmsA, rel: rel(ours.capacitorRippleCurrentRmsA, ref.capacitorRmsA) },
  };
  results.push(row);
  console.log(
    `${row.case}: ngspice ${row.ngspiceMs} ms (${periods} periods; a 1-period run takes ${row.ngspiceOneTinyRunMs} ms), ours ${row.oursMs} ms (${oursPeriods} periods) → ${row.ratio}x (${row.ratioNetOfStartup}x net of ngspice start-up); ` +
      `ΔVdc ${(row.dcOutputV.rel * 100).toFixed(3)} %, Δripple ${(row.rippleVpp.rel * 100).toFixed(3)} %, max Δ element RMS ${(row.maxRelElementRms * 100).toFixed(3)} %, max Δ element loss ${(row.maxRelElementLoss * 100).toFixed(3)} %`,
  );
}
mkdirSync("bench/out", { recursive: true });
writeFileSync("bench/out/bridge-ac-vs-ngspice.json", `${JSON.stringify(results, null, 2)}\n`);
