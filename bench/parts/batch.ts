/**
 * The batch of a generated JSON Lines file against a pass-through that parses and re-serialises
 * every line (one process each), alternating runs, the median of the paired ratios; peak RSS of
 * the batch process (all its threads) from the preload in lib/max-rss.ts.
 */
import { createWriteStream, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { opCase } from "../lib/payloads.js";
import { dist, log, quick, root, RSS_PRELOAD, runNode } from "../lib/processes.js";
import { median, type PartResult, pairedRatio, round } from "../lib/stats.js";

export async function batch(): Promise<PartResult> {
  const lines = Number(process.env.BENCH_BATCH_LINES ?? (quick ? 100_000 : 1_000_000));
  const rounds = Number(process.env.BENCH_ROUNDS ?? (quick ? 3 : 5));
  const dir = mkdtempSync(join(tmpdir(), "backstop-bench-"));
  try {
    const input = join(dir, "in.jsonl");
    const out = createWriteStream(input);
    for (let k = 0; k < lines; k += 1) {
      if (!out.write(`${JSON.stringify({ id: k, procedure: "operatingPoint", input: opCase(k) })}\n`))
        await new Promise<void>((r) => out.once("drain", () => r()));
    }
    await new Promise<void>((r) => out.end(() => r()));
    const rssOf = (file: string) =>
      Math.max(
        ...readFileSync(file, "utf8")
          .trim()
          .split("\n")
          .map((l) => (JSON.parse(l) as { maxRssKB: number }).maxRssKB),
      ) / 1024;
    const passMs: number[] = [];
    const batchMs: number[] = [];
    const passRss: number[] = [];
    const batchRss: number[] = [];
    let batchStderr = "";
    for (let r = 0; r < rounds; r += 1) {
      log(`batch: pass-through of ${lines} lines (round ${r + 1} of ${rounds})`);
      const passRssFile = join(dir, `pass-${r}.rss`);
      const pass = await runNode(
        ["--import", RSS_PRELOAD, dist("bench", "lib", "batch-passthrough.js"), input, join(dir, `pass-${r}.jsonl`)],
        { BENCH_RSS_FILE: passRssFile },
      );
      if (pass.code !== 0) throw new Error(`pass-through failed: ${pass.stderr}`);
      rmSync(join(dir, `pass-${r}.jsonl`), { force: true });
      log(`batch: backstop batch of ${lines} lines (round ${r + 1} of ${rounds})`);
      const batchRssFile = join(dir, `batch-${r}.rss`);
      const run = await runNode(
        [
          "--import",
          RSS_PRELOAD,
          join(root, "bin", "backstop.mjs"),
          "batch",
          "--in",
          input,
          "--out",
          join(dir, `out-${r}.jsonl`),
        ],
        { BENCH_RSS_FILE: batchRssFile, BACKSTOP_PROGRESS_MS: "60000" },
      );
      if (run.code !== 0) throw new Error(`batch failed (${run.code}): ${run.stderr}`);
      rmSync(join(dir, `out-${r}.jsonl`), { force: true });
      passMs.push(pass.wallMs);
      batchMs.push(run.wallMs);
      passRss.push(rssOf(passRssFile));
      batchRss.push(rssOf(batchRssFile));
      batchStderr = run.stderr.trim().split("\n").at(-1) ?? "";
    }
    const rate = (ms: number) => (lines * 1000) / ms;
    const r = pairedRatio(batchMs.map(rate), passMs.map(rate));
    const peak = median(batchRss);
    const n = lines.toLocaleString("en-US");
    return {
      rows: [
        {
          part: "batch",
          metric: `pass-through (parse + re-serialise), ${n} lines (median of ${rounds})`,
          value: Math.round(rate(median(passMs))),
          unit: "lines/s",
        },
        {
          part: "batch",
          metric: `backstop batch, default workers (median of ${rounds} alternating)`,
          value: Math.round(rate(median(batchMs))),
          unit: "lines/s",
          baseline: "pass-through",
          ratio: round(r.median),
          spread: [round(r.spread[0]), round(r.spread[1])],
          target: "≥ 0.4",
          pass: r.median >= 0.4,
        },
        {
          part: "batch",
          metric: `backstop batch peak RSS, process and its threads (median of ${rounds})`,
          value: round(peak, 0),
          unit: "MB",
          spread: [round(Math.min(...batchRss), 0), round(Math.max(...batchRss), 0)],
          target: "≤ 300",
          pass: peak <= 300,
        },
      ],
      details: {
        lines,
        rounds,
        passThroughMs: passMs,
        batchMs,
        passThroughRssMB: passRss,
        batchRssMB: batchRss,
        batchStderr,
      },
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
