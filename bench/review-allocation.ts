/**
 * What one example review (examples/requests/review.json) allocates, in process: V8's sampling
 * heap profiler (node:inspector, one sample every 4 kB, the objects already collected counted
 * too) over ROUNDS calls, the bytes a call by file, largest first, and the milliseconds a call
 * (median, lowest and highest). The soak's memory follows the compute threads' allocation rate,
 * not only the answer's size (docs/performance.md). A script, not a test: `npm run
 * bench:review-allocation`.
 */
import { readFileSync } from "node:fs";
import { Session } from "node:inspector/promises";
import { join } from "node:path";
import { loadCatalogFile } from "../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG, projectRoot } from "../adapters/project-root.js";
import { callProcedure } from "../api/procedure-registry.js";

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 10);
const ctx = { catalog: loadCatalogFile(DEMO_CATALOG()) };
const input = (
  JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", "review.json"), "utf8")) as { input: unknown }
).input;
const call = () => JSON.stringify(callProcedure("review", ctx, input)).length;
for (let i = 0; i < 3; i += 1) call(); // warm-up

const ms: number[] = [];
for (let i = 0; i < ROUNDS; i += 1) {
  const t0 = performance.now();
  call();
  ms.push(performance.now() - t0);
}
ms.sort((a, b) => a - b);

interface ProfileNode {
  readonly callFrame: { readonly url: string };
  readonly selfSize: number;
  readonly children: readonly ProfileNode[];
}
const session = new Session();
session.connect();
await session.post("HeapProfiler.startSampling", {
  samplingInterval: 4096,
  includeObjectsCollectedByMajorGC: true,
  includeObjectsCollectedByMinorGC: true,
});
for (let i = 0; i < ROUNDS; i += 1) call();
const { profile } = (await session.post("HeapProfiler.stopSampling")) as unknown as { profile: { head: ProfileNode } };
session.disconnect();

const byFile = new Map<string, number>();
let total = 0;
const walk = (n: ProfileNode): void => {
  const file = n.callFrame.url.replace(/^.*\/dist\//, "") || "(native)";
  byFile.set(file, (byFile.get(file) ?? 0) + n.selfSize);
  total += n.selfSize;
  for (const c of n.children) walk(c);
};
walk(profile.head);
const mb = (b: number) => (b / ROUNDS / 1e6).toFixed(1).padStart(7);
console.log(
  `review: ${mb(total)} MB allocated a call (sampled, ${ROUNDS} calls); ${(ms[Math.floor(ROUNDS / 2)] ?? 0).toFixed(0)} ms a call (${(ms[0] ?? 0).toFixed(0)}-${(ms.at(-1) ?? 0).toFixed(0)}), node ${process.version}`,
);
for (const [file, b] of [...byFile].sort((x, y) => y[1] - x[1]).slice(0, 8)) console.log(`${mb(b)} MB  ${file}`);
