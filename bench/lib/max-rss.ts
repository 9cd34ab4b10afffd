/** Preload (`node --import`) for benchmarks: on exit, append this process's peak RSS (kB, all threads) to $BENCH_RSS_FILE. */
import { appendFileSync } from "node:fs";

const file = process.env.BENCH_RSS_FILE;
if (file)
  process.on("exit", () =>
    appendFileSync(file, `${JSON.stringify({ pid: process.pid, maxRssKB: process.resourceUsage().maxRSS })}\n`),
  );
