/**
 * Benchmark: the design review in process on one core. One review of 4 candidates over
 * 24 corners (3 supplies × 2 ambients × 2 load levels × 2 tolerances) with the default rule set,
 * and a Monte Carlo of 10 000 samples for one candidate. Run: npm run bench:review.
 * Targets (issue 4): ≥ 2,000 reviews/s per core; 10 000 samples in ≤ 100 ms.
 */
import { procedureInvoker } from "../adapters/batch/run-batch.js";
import { loadCatalogFile } from "../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG } from "../adapters/project-root.js";

const invoke = procedureInvoker({ catalog: loadCatalogFile(DEMO_CATALOG()) })("review");
if (invoke === undefined) throw new Error("review procedure missing");

const candidates = ["demo-schottky-10a-60v", "demo-pfet-40v-12mohm", "demo-ideal-diode-60v-3mohm", "demo-integrated-ideal-diode-5a-36v"].map((partId) => ({
  stage: { kind: "catalog-part", partId },
  datasheetMax: { rdsOnFactor: 1.3, forwardVoltageFactor: 1.1 },
}));
const review = {
  requirement: {
    supply: { class: "vehicle-12v-b" },
    sourceResistanceOhm: 0.03,
    load: { kind: "constant-current", currentA: 3 },
    loadMinV: 7,
    ambient: { minC: -40, maxC: 85 },
    inputClamp: { standoffV: 18, clampV: 30 },
  },
  candidates,
};
const withMc = { ...review, candidates: [candidates[2]], monteCarlo: { samples: 10_000, seed: 1, tolerances: [{ parameter: "rdsOn", distribution: "normal", sigma: 0.08 }, { parameter: "ambientC", distribution: "normal", sigma: 3 }] } };

async function timeIt(label: string, seconds: number, input: unknown): Promise<{ label: string; perSecond: number; msEach: number }> {
  if (invoke === undefined) throw new Error("unreachable");
  for (let i = 0; i < 3; i += 1) await invoke(input);
  let n = 0;
  const t0 = performance.now();
  while (performance.now() - t0 < seconds * 1000) {
    await invoke(input);
    n += 1;
  }
  const ms = performance.now() - t0;
  return { label, perSecond: (n * 1000) / ms, msEach: ms / n };
}

const rows = [await timeIt("review: 4 candidates × 24 corners, default rules", 5, review), await timeIt("Monte Carlo: 10 000 samples, 1 candidate", 5, withMc)];
for (const r of rows) console.log(`${r.label.padEnd(52)} ${r.perSecond.toFixed(1).padStart(10)} /s ${r.msEach.toFixed(3).padStart(10)} ms each`);
console.log(JSON.stringify({ review: rows[0], monteCarlo: rows[1] }));
