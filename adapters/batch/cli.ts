import { createReadStream } from "node:fs";
import { availableParallelism } from "node:os";
import { dirname, resolve } from "node:path";
import { parseArgs } from "node:util";
import { procedureEntry } from "../../api/procedure-registry.js";
import { loadCatalog } from "../catalog/catalog-source.js";
import { CATALOG_USAGE, catalogCommand } from "../catalog/import-cli.js";
import { type ComputePool, catalogData, createComputePool } from "../compute/pool.js";
import { DEMO_CATALOG } from "../project-root.js";
import { writeStreamAtomic } from "../atomic-file.js";
import { loadRuleSetStore } from "../rulesets/registry.js";
import { recordKeyFromEnv, recordSignerOf } from "../record/signing-key.js";
import { buildVersion } from "../../api/record/build-version.js";
import { formatOf } from "./formats.js";
import { mergeShards } from "./merge.js";
import { proceduresNamedIn } from "./output-procedures.js";
import type { BatchCounts } from "./line.js";
import { REPORT_RENDERERS } from "../report/report-body.js";
import { reportFailed, reportNamer, writeBridgeAcReport, writeReviewReport } from "../report/write-report.js";
import type { Shard } from "./answer.js";
import { type RowHook, streamBatch } from "./engine.js";
import { HOLDING, type VerifyCounts, verifyFile } from "./verify-file.js";

const USAGE = `usage:
  backstop --help | backstop batch --help | backstop merge --help
  backstop batch --in requests.jsonl|.csv --out results.jsonl|.csv [--procedure NAME] [--shard i/N | --shard N]
                 [--workers N] [--catalog parts.json|folder] [--in-format jsonl|csv] [--out-format jsonl|csv] [--report-dir folder]
  backstop merge --out results.jsonl|.csv shard-0 shard-1 ...
  backstop verify --in records.jsonl --out report.jsonl [--catalog parts.json|folder]
${CATALOG_USAGE}
  --shard N takes the index from JOB_COMPLETION_INDEX; "{shard}" in --out is replaced by the index.
  --report-dir writes each answered review and bridgeAc line as <id>.html, <id>.md and <id>-charts/*.svg.
  a CSV input needs a "procedure" column or --procedure; blank lines are skipped (counted apart, never a row).
  a curve's points may be { "csv": "curves/vf.csv" }: a CSV file in the input file's folder (or below it).
  verify: each line a filed record { id, procedure, input, result }; each report line says unchanged,
  numbers-changed, verdict-changed, tampered, signature-failed, no-record, recompute-failed or unreadable.
  exit 0: every row answered (verify: every verdict holds); 1: some rows rejected (verify: some do not); 2: could not run.`;

class UsageError extends Error {}

const logLine = (line: string) => process.stderr.write(`${line}\n`);

export function parseShard(spec: string | undefined, env: NodeJS.ProcessEnv): Shard | undefined {
  if (spec === undefined) return undefined;
  const m = /^(?:(\d+)\/)?(\d+)$/.exec(spec);
  if (!m) throw new UsageError(`--shard "${spec}": expected i/N or N`);
  const count = Number(m[2]);
  const rawIndex = m[1] ?? env.JOB_COMPLETION_INDEX;
  if (rawIndex === undefined || !/^\d+$/.test(rawIndex))
    throw new UsageError(`--shard ${spec}: no index given and JOB_COMPLETION_INDEX is not set`);
  const index = Number(rawIndex);
  if (!(count >= 1 && index < count)) throw new UsageError(`--shard ${index}/${count}: need 0 <= i < N`);
  return { index, count };
}

/** Progress on stderr: a redrawn line on a terminal, else a counter and rate every few seconds. */
function progress(everyMs: number) {
  const tty = process.stderr.isTTY === true;
  const t0 = performance.now();
  let last = 0;
  const text = (c: BatchCounts) => {
    const s = (performance.now() - t0) / 1000;
    return `backstop batch: ${c.lines} rows, ${c.failed} rejected${c.blank > 0 ? `, ${c.blank} blank lines skipped` : ""}, ${Math.round(c.lines / Math.max(s, 1e-3))} rows/s`;
  };
  return {
    tick(c: BatchCounts) {
      const now = performance.now();
      if (now - last < (tty ? 200 : everyMs)) return;
      last = now;
      process.stderr.write(tty ? `\r${text(c)}` : `${text(c)}\n`);
    },
    done(c: BatchCounts, out: string) {
      process.stderr.write(`${tty ? "\r" : ""}${text(c)}; ${c.ok} ok -> ${out}\n`);
    },
  };
}

async function batch(rest: string[]): Promise<number> {
  const { values } = parseArgs({
    args: rest,
    options: {
      in: { type: "string" },
      out: { type: "string" },
      catalog: { type: "string" },
      procedure: { type: "string" },
      shard: { type: "string" },
      workers: { type: "string" },
      "in-format": { type: "string" },
      "out-format": { type: "string" },
      "report-dir": { type: "string" },
      help: { type: "boolean", short: "h" },
    },
  });
  if (values.help === true) return usage();
  if (values.in === undefined || values.out === undefined) throw new UsageError("--in and --out are required");
  if (values.procedure !== undefined && procedureEntry(values.procedure) === undefined)
    throw new UsageError(`--procedure: no procedure "${values.procedure}"`);
  const shard = parseShard(values.shard, process.env);
  const outPath = values.out.replaceAll("{shard}", String(shard?.index ?? 0));
  const inFormat = formatOf(values.in, values["in-format"]);
  const outFormat = formatOf(outPath, values["out-format"]);
  // default: cores − 1 threads, at least one; the main thread reads, writes and, for JSON Lines input,
  // answers a chunk itself whenever every thread has one (so on two cores both compute). Row
  // `batch-node22` (Node 22, 250,000 operating points, verdict records on): 0.09 (0.06-0.23) of the
  // bench's pass-through at a host load of 5-11, peak RSS 312 MB (280-326), the thread holding its
  // own router and heap
  const cores = availableParallelism();
  const workers = values.workers === undefined ? Math.max(1, Math.min(8, cores - 1)) : Number(values.workers);
  if (!Number.isInteger(workers) || workers < 0)
    throw new UsageError("--workers must be a whole number (0: no worker threads)");
  const catalogPath = values.catalog ?? process.env.BACKSTOP_CATALOG ?? DEMO_CATALOG();
  const catalog = loadCatalog(catalogPath);
  const rulesDir = process.env.BACKSTOP_RULES_DIR;
  const ruleSets = loadRuleSetStore(rulesDir);
  const recordKeyPem = recordKeyFromEnv();
  buildVersion(); // a bad BACKSTOP_BUILD_ID stops the run before the first row
  const recordSigner = recordKeyPem === undefined ? undefined : recordSignerOf(recordKeyPem);
  for (const r of ruleSets.refused())
    process.stderr.write(
      `backstop batch: rule set file ${r.file} refused: ${r.problems.map((p) => p.message).join("; ")}\n`,
    );
  // a CSV output's header holds the result columns of the procedures the input names
  const outputProcedures =
    outFormat === "csv" && values.procedure === undefined ? await proceduresNamedIn(values.in, inFormat) : undefined;
  const input = createReadStream(values.in);
  const curveFolder = dirname(resolve(values.in));
  await new Promise<void>((resolve, reject) => {
    input.once("open", () => resolve());
    input.once("error", reject);
  });
  const pool: ComputePool | undefined =
    workers > 0
      ? createComputePool({
          threads: workers,
          catalog: catalogData(catalog),
          rulesDir,
          recordKeyPem,
        })
      : undefined;
  const p = progress(Number(process.env.BACKSTOP_PROGRESS_MS ?? 5000));
  let counts: BatchCounts = { lines: 0, ok: 0, failed: 0, blank: 0 };
  const reportDir = values["report-dir"];
  const nameOf = reportNamer();
  let drawn = 0;
  const onRow: RowHook = (row, procedure) => {
    try {
      (procedure === "review" ? writeReviewReport : writeBridgeAcReport)(
        reportDir as string,
        nameOf(row.id, row.line),
        row.result,
        row.id ?? undefined,
      );
    } catch (e) {
      // that line's error row; the batch goes on
      return reportFailed(procedure, e);
    }
    drawn += 1;
    return undefined;
  };
  // the report procedures and the flag that asks each for its chart data (a review's curves, a bridgeAc's waveform)
  const flags = Object.fromEntries(Object.entries(REPORT_RENDERERS).map(([p, r]) => [p, r.flag]));
  try {
    await writeStreamAtomic(
      outPath,
      async (write) => {
        const reports = reportDir === undefined ? undefined : { flags, onRow };
        counts = await streamBatch({
          input,
          inFormat,
          outFormat,
          write,
          ctx: { catalog, ruleSets, recordSigner },
          procedure: values.procedure,
          outputProcedures,
          shard,
          curveFolder,
          pool,
          onProgress: (c) => p.tick(c),
          reports,
          poolOnly: process.env.BACKSTOP_TEST_WORKER_FAULT !== undefined,
        });
      },
      logLine,
    );
  } finally {
    await pool?.close();
  }
  p.done(counts, outPath);
  if (reportDir) process.stderr.write(`backstop batch: ${drawn} report(s) -> ${reportDir}\n`);
  return counts.failed > 0 ? 1 : 0;
}

async function merge(rest: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: rest,
    allowPositionals: true,
    options: { out: { type: "string" }, format: { type: "string" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help === true) return usage();
  if (values.out === undefined || positionals.length === 0)
    throw new UsageError("merge needs --out and at least one shard file");
  const format = formatOf(values.out, values.format);
  let n = 0;
  await writeStreamAtomic(
    values.out,
    async (write) => {
      n = await mergeShards(positionals, format, write);
    },
    logLine,
  );
  process.stderr.write(`backstop merge: ${positionals.length} shards, ${n} rows -> ${values.out}\n`);
  return 0;
}

/** `backstop verify`: every filed record checked and recomputed under today's models, rules and catalog. */
async function verify(rest: string[]): Promise<number> {
  const { values } = parseArgs({
    args: rest,
    options: {
      in: { type: "string" },
      out: { type: "string" },
      catalog: { type: "string" },
      help: { type: "boolean", short: "h" },
    },
  });
  if (values.help === true) return usage();
  if (values.in === undefined || values.out === undefined) throw new UsageError("--in and --out are required");
  const catalog = loadCatalog(values.catalog ?? process.env.BACKSTOP_CATALOG ?? DEMO_CATALOG());
  const ruleSets = loadRuleSetStore(process.env.BACKSTOP_RULES_DIR);
  for (const r of ruleSets.refused())
    process.stderr.write(
      `backstop verify: rule set file ${r.file} refused: ${r.problems.map((p) => p.message).join("; ")}\n`,
    );
  const recordKeyPem = recordKeyFromEnv();
  buildVersion();
  const ctx = {
    catalog,
    ruleSets,
    recordSigner: recordKeyPem === undefined ? undefined : recordSignerOf(recordKeyPem),
  };
  const inPath = values.in;
  let counts: VerifyCounts | undefined;
  await writeStreamAtomic(
    values.out,
    async (write) => {
      counts = await verifyFile(inPath, write, ctx);
    },
    logLine,
  );
  const c = counts as VerifyCounts;
  const text = Object.entries(c)
    .filter(([, n]) => n > 0)
    .map(([s, n]) => `${n} ${s}`)
    .join(", ");
  process.stderr.write(`backstop verify: ${text || "no records"} -> ${values.out}\n`);
  return Object.entries(c).every(([s, n]) => n === 0 || HOLDING.has(s)) ? 0 : 1;
}

/** The usage on stdout, asked for (`--help`): exit 0. */
function usage(): number {
  process.stdout.write(`${USAGE}\n`);
  return 0;
}

/** `backstop batch` / `merge` / `verify` / `catalog import`: exit 0 all rows ok (verify: every verdict holds), 1 some not, 2 could not run. */
export async function main(argv: string[]): Promise<number> {
  const [verb, ...rest] = argv;
  try {
    if (verb === "batch") return await batch(rest);
    if (verb === "merge") return await merge(rest);
    if (verb === "verify") return await verify(rest);
    if (verb === "catalog") return catalogCommand(rest, logLine);
    if (verb === "--help" || verb === "-h" || verb === "help") return usage();
    throw new UsageError(
      verb === undefined
        ? "no command (backstop batch, merge, verify or catalog; backstop --help for usage)"
        : `unknown command "${verb}" (backstop batch, merge, verify or catalog)`,
    );
  } catch (e) {
    if (e instanceof UsageError || (e as { code?: string }).code?.startsWith("ERR_PARSE_ARGS"))
      process.stderr.write(`${(e as Error).message}\n${USAGE}\n`);
    else process.stderr.write(`backstop could not run: ${(e as Error).message}\n`);
    return 2;
  }
}
