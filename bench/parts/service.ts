/** The service as a whole: the heavy review over HTTP against in process, bulk /v1, start-up. */
import { availableParallelism } from "node:os";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { loadCatalogFile } from "../../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG } from "../../adapters/project-root.js";
import { opCase, reviewInput, reviewJson } from "../lib/payloads.js";
import { drive, type Load, log, MAIN, quick, startServer, stop } from "../lib/processes.js";
import { median, type PartResult, pairedRatio, round } from "../lib/stats.js";

/**
 * The review over /v1 with one compute thread against the same review in this process, one core
 * each: alternating runs (in process, then over HTTP), the median of the paired ratios.
 */
export async function reviewOverHttp(): Promise<PartResult> {
  const seconds = quick ? 2 : 5;
  const rounds = Number(process.env.BENCH_ROUNDS ?? (quick ? 3 : 5));
  const invoke = procedureInvoker({ catalog: loadCatalogFile(DEMO_CATALOG()) })("review");
  if (invoke === undefined) throw new Error("no review procedure");
  for (let i = 0; i < 5; i += 1) await invoke(reviewInput);
  const s = await startServer(MAIN, { BACKSTOP_WORKERS: "1" });
  const inProcess: number[] = [];
  const v1: Load[] = [];
  try {
    for (let r = 0; r < rounds; r += 1) {
      log(`review in process, round ${r + 1}/${rounds}`);
      let n = 0;
      const t0 = performance.now();
      while (performance.now() - t0 < seconds * 1000) {
        await invoke(reviewInput);
        n += 1;
      }
      inProcess.push((n * 1000) / (performance.now() - t0));
      log(`review over /v1, 1 compute thread, round ${r + 1}/${rounds}`);
      v1.push(await drive(s.base, [{ path: "/v1/review", body: reviewJson }], 4, seconds));
    }
  } finally {
    await stop(s);
  }
  const overHttp = v1.map((l) => l.requestsPerSecond);
  const r = pairedRatio(overHttp, inProcess);
  const bad = v1.reduce((s, l) => s + l.errors + l.timeouts + l.non2xx, 0);
  return {
    rows: [
      {
        part: "review",
        metric: `review in process, one core (median of ${rounds})`,
        value: round(median(inProcess), 1),
        unit: "reviews/s",
      },
      {
        part: "review",
        metric: `review over /v1, 1 compute thread, 4 conns (median of ${rounds} alternating)`,
        value: round(median(overHttp), 1),
        unit: "reviews/s",
        baseline: "in process",
        ratio: round(r.median),
        spread: [round(r.spread[0]), round(r.spread[1])],
        target: "≥ 0.8",
        pass: r.median >= 0.8,
      },
      {
        part: "review",
        metric: "review over /v1 errors + timeouts + non-2xx",
        value: bad,
        unit: "",
        target: "0",
        pass: bad === 0,
      },
    ],
    details: { rounds, seconds, inProcessPerSecond: inProcess, v1 },
  };
}

/** Bulk /v1 of 1,000 operating points on the default compute threads. */
export async function bulk(): Promise<PartResult> {
  const seconds = quick ? 3 : 6;
  const body = JSON.stringify(Array.from({ length: 1000 }, (_, k) => opCase(k)));
  const s = await startServer(MAIN);
  let l: Load;
  try {
    log("bulk: /v1/operatingPoint/bulk × 1000 cases");
    l = await drive(s.base, [{ path: "/v1/operatingPoint/bulk", body }], 2, seconds);
  } finally {
    await stop(s);
  }
  const points = l.requestsPerSecond * 1000;
  const bad = l.errors + l.timeouts + l.non2xx;
  return {
    rows: [
      {
        part: "bulk",
        metric: `bulk /v1 of 1,000 operating points (${availableParallelism()} cores)`,
        value: Math.round(points),
        unit: "points/s",
        target: "≥ 50,000",
        pass: points >= 50_000,
      },
      { part: "bulk", metric: "bulk request p99", value: l.p99Ms, unit: "ms" },
      { part: "bulk", metric: "bulk errors + timeouts + non-2xx", value: bad, unit: "", target: "0", pass: bad === 0 },
    ],
    details: l,
  };
}

/** Process start to the first 200 from /readyz, the median of several starts. */
export async function startUp(): Promise<PartResult> {
  const runs = quick ? 3 : 7;
  const ms: number[] = [];
  for (let i = 0; i < runs; i += 1) {
    const t0 = performance.now();
    const s = await startServer(MAIN);
    for (let k = 0; k < 5000; k += 1) {
      const ok = await fetch(`${s.base}/readyz`).then(
        (r) => r.status === 200,
        () => false,
      );
      if (ok) break;
      await new Promise((r) => setTimeout(r, 2));
    }
    ms.push(performance.now() - t0);
    await stop(s);
  }
  const m = median(ms);
  return {
    rows: [
      {
        part: "start-up",
        metric: `process start to /readyz 200 (median of ${runs})`,
        value: round(m, 0),
        unit: "ms",
        spread: [round(Math.min(...ms), 0), round(Math.max(...ms), 0)],
        target: "≤ 500",
        pass: m <= 500,
      },
    ],
    details: { ms },
  };
}
