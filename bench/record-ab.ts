/**
 * A/B of two builds of the server on single /v1/operatingPoint calls, like for like: each side one
 * server process as `npm start` runs it, beside the one-process Hono echo of the http part, the same
 * body, 32 connections, autocannon in a process of its own. The three take turns in every round
 * (the order rotates round by round), and each ratio is the median of the rounds' paired ratios with
 * their spread. A script, not a test, and not a part of `npm run bench`: the "before" side is a
 * build of another commit, made by hand (check it out, `npm run build`, copy `dist/bundle` to
 * `dist/bundle-before`, come back and build again), named by BENCH_BEFORE_MAIN.
 *
 * Run: npm run build && tsc -p tsconfig.bench.json && node dist/bench/record-ab.js
 * (BENCH_ROUNDS, default 5; BENCH_HTTP_SECONDS, default 5). Prints one JSON document.
 */
import { loadavg } from "node:os";
import { type Load, dist, drive, log, MAIN, startServer, stop } from "./lib/processes.js";
import { opJson } from "./lib/payloads.js";
import { median, pairedRatio, round } from "./lib/stats.js";

const seconds = Number(process.env.BENCH_HTTP_SECONDS ?? 5);
const rounds = Number(process.env.BENCH_ROUNDS ?? 5);
const beforeMain = process.env.BENCH_BEFORE_MAIN ?? dist("bundle-before", "main.js");

const servers = await Promise.all([
  startServer(dist("bench", "lib", "echo-hono.js")),
  startServer(beforeMain, { LOG_LEVEL: "info" }),
  startServer(MAIN, { LOG_LEVEL: "info" }),
]);
const [echo, before, after] = servers;
if (echo === undefined || before === undefined || after === undefined) throw new Error("a server did not start");
const targets = [
  { name: "echo", base: echo.base, path: "/echo" },
  { name: "before", base: before.base, path: "/v1/operatingPoint" },
  { name: "after", base: after.base, path: "/v1/operatingPoint" },
];
const got: Record<string, Load[]> = {};
const loads: number[][] = [];
try {
  for (let r = 0; r < rounds; r += 1) {
    loads.push(loadavg().map((x) => round(x)));
    for (let i = 0; i < targets.length; i += 1) {
      const t = targets[(i + r) % targets.length];
      if (t === undefined) continue;
      log(`record A/B: ${t.name}, round ${r + 1}/${rounds}`);
      const l = await drive(t.base, [{ path: t.path, body: opJson }], 32, seconds);
      got[t.name] = [...(got[t.name] ?? []), l];
    }
  }
  loads.push(loadavg().map((x) => round(x)));
} finally {
  await Promise.all(servers.map(stop));
}
const rates = (name: string) => (got[name] ?? []).map((l) => Math.round(l.requestsPerSecond));
const ratio = (a: string, b: string) => {
  const r = pairedRatio(rates(a), rates(b));
  return { median: round(r.median), spread: r.spread.map((x) => round(x)) };
};
const bad = (name: string) => (got[name] ?? []).reduce((s, l) => s + l.errors + l.timeouts + l.non2xx, 0);
process.stdout.write(
  `${JSON.stringify(
    {
      beforeMain,
      seconds,
      rounds,
      connections: 32,
      loadAverageEachRound: loads,
      ratesReqPerS: Object.fromEntries(targets.map((t) => [t.name, rates(t.name)])),
      medianReqPerS: Object.fromEntries(targets.map((t) => [t.name, Math.round(median(rates(t.name)))])),
      p99Ms: Object.fromEntries(targets.map((t) => [t.name, median((got[t.name] ?? []).map((l) => l.p99Ms))])),
      errorsTimeoutsNon2xx: Object.fromEntries(targets.map((t) => [t.name, bad(t.name)])),
      beforeToEcho: ratio("before", "echo"),
      afterToEcho: ratio("after", "echo"),
      afterToBefore: ratio("after", "before"),
    },
    null,
    1,
  )}\n`,
);
