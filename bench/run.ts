/**
 * `npm run bench`: every benchmark of backstop, each ratio against a baseline measured in the same
 * run, like for like (one server process against a one-process baseline, one core against one
 * core) and as the median of alternating runs with their spread (the machine is shared and noisy),
 * with the absolute figures beside them. Prints a table and writes bench/results.json. A script,
 * not a test: each part is bounded in time; BENCH_QUICK=1 shortens every part, BENCH_ROUNDS sets
 * the alternating runs (default 5), BENCH_ONLY=http,batch runs some parts and replaces only their
 * entries in bench/results.json.
 *
 * Parts (bench/parts/): http (/v1 and /trpc against a bare Hono JSON echo), review (over HTTP
 * against in process), bulk, batch (against a parse-and-re-serialise pass-through, with peak RSS),
 * start-up to /readyz, and the analysis benches (review, rule evaluation, AC bridge vs ngspice).
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { availableParallelism, cpus, loadavg } from "node:os";
import { join } from "node:path";
import { analyses } from "./parts/analyses.js";
import { batch } from "./parts/batch.js";
import { httpOverhead } from "./parts/http.js";
import { bulk, reviewOverHttp, startUp } from "./parts/service.js";
import { root } from "./lib/processes.js";
import type { PartResult, Row } from "./lib/stats.js";
import { measuredOn, round } from "./lib/stats.js";

interface PartEntry extends PartResult {
  /** when and where the part ran */
  readonly measured: {
    readonly at: string;
    readonly cores: number;
    readonly cpu: string;
    readonly node: string;
    readonly loadAverageAtStart: number[];
    readonly loadAverageAtEnd: number[];
    readonly seconds: number;
    /** an entry kept from an earlier run: its commit and how it was measured */
    readonly code?: string;
    readonly note?: string;
  };
}

const parts: [string, () => Promise<PartResult>][] = [
  ["http", httpOverhead],
  ["review", reviewOverHttp],
  ["bulk", bulk],
  ["batch", batch],
  ["start-up", startUp],
  ["analyses", analyses],
];
const only = process.env.BENCH_ONLY?.split(",");
const file = join(root, "bench", "results.json");
const previous =
  (existsSync(file)
    ? (JSON.parse(readFileSync(file, "utf8")) as { parts?: Record<string, PartEntry> }).parts
    : undefined) ?? {};
const entries: Record<string, PartEntry> = only ? { ...previous } : {};
const rows: Row[] = [];
for (const [name, f] of parts) {
  if (only && !only.includes(name)) continue;
  const loadAverageAtStart = loadavg().map((x) => round(x));
  const t0 = performance.now();
  let result: PartResult;
  try {
    result = await f();
  } catch (e) {
    result = {
      rows: [
        {
          part: name,
          metric: `failed: ${(e as Error).message.slice(0, 300)}`,
          value: Number.NaN,
          unit: "",
          pass: false,
        },
      ],
      details: {},
    };
  }
  const measured = measuredOn(loadAverageAtStart, t0);
  entries[name] = { measured, ...result };
  rows.push(...result.rows);
}

const fmt = (v: number) => (Number.isNaN(v) ? "—" : v.toLocaleString("en-US", { maximumFractionDigits: 3 }));
const header = ["part", "metric", "value", "unit", "vs", "ratio", "spread", "target", "ok"];
const table = rows.map((r) => [
  r.part,
  r.metric,
  fmt(r.value),
  r.unit,
  r.baseline ?? "",
  r.ratio === undefined ? "" : String(r.ratio),
  r.spread === undefined ? "" : `${r.spread[0]}–${r.spread[1]}`,
  r.target ?? "",
  r.pass === undefined ? "" : r.pass ? "yes" : "NO",
]);
const widths = header.map((h, i) => Math.max(h.length, ...table.map((t) => (t[i] as string).length)));
const line = (cells: string[]) =>
  cells
    .map((c, i) => (i === 2 || i === 5 ? c.padStart(widths[i] as number) : c.padEnd(widths[i] as number)))
    .join("  ");
process.stdout.write(
  `${line(header)}\n${widths.map((w) => "-".repeat(w)).join("  ")}\n${table.map(line).join("\n")}\n`,
);
process.stdout.write(
  `\nmachine: ${availableParallelism()} cores, ${cpus()[0]?.model ?? "unknown"}, node ${process.version}; load average now ${loadavg()
    .map((x) => round(x))
    .join(" ")}\n`,
);
writeFileSync(file, `${JSON.stringify({ parts: entries }, null, 2)}\n`);
