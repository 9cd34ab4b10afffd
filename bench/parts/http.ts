/**
 * HTTP overhead, like for like: the server as `npm start` runs it (one HTTP process) against a
 * one-process bare Hono JSON echo on @hono/node-server, autocannon from a process of its own, 32 connections, the same operating-point body. The targets
 * take turns in every round (alternating, so a burst of outside load falls on one run of each
 * rather than on all runs of one), and each ratio is the median of the rounds' paired ratios with
 * their spread.
 */
import { type Load, dist, drive, log, MAIN, quick, startServer, stop } from "../lib/processes.js";
import { opJson } from "../lib/payloads.js";
import { median, type PartResult, pairedRatio, round, type Row } from "../lib/stats.js";

/** the single-call guard of issue 20: /v1/operatingPoint at least this share of the Hono echo */
const GUARD = 0.4;

export async function httpOverhead(): Promise<PartResult> {
  const seconds = Number(process.env.BENCH_HTTP_SECONDS ?? (quick ? 2 : 5));
  const rounds = Number(process.env.BENCH_ROUNDS ?? (quick ? 3 : 5));
  const logLevel = process.env.BENCH_LOG_LEVEL ?? "info";
  const servers = await Promise.all([
    startServer(dist("bench", "lib", "echo-hono.js")),
    startServer(MAIN, { LOG_LEVEL: logLevel }),
  ]);
  const [echoHono, backstop] = servers;
  const targets = [
    { name: "Hono echo", base: echoHono.base, path: "/echo" },
    { name: "/v1/operatingPoint", base: backstop.base, path: "/v1/operatingPoint" },
    { name: "/trpc/operatingPoint", base: backstop.base, path: "/trpc/operatingPoint" },
  ];
  const got: Record<string, Load[]> = {};
  try {
    for (let r = 0; r < rounds; r += 1) {
      for (const t of targets) {
        log(`http: ${t.name}, round ${r + 1}/${rounds}`);
        const l = await drive(t.base, [{ path: t.path, body: opJson }], 32, seconds);
        got[t.name] = [...(got[t.name] ?? []), l];
      }
    }
  } finally {
    await Promise.all(servers.map(stop));
  }
  const rates = (name: string) => (got[name] ?? []).map((l) => l.requestsPerSecond);
  const hono = rates("Hono echo");
  const rows: Row[] = [];
  for (const t of targets) {
    const ls = got[t.name] ?? [];
    const r = pairedRatio(rates(t.name), hono);
    const guarded = t.name === "/v1/operatingPoint";
    rows.push({
      part: "http",
      metric: `${t.name} rate, one process, 32 conns (median of ${rounds} alternating runs)`,
      value: Math.round(median(rates(t.name))),
      unit: "req/s",
      baseline: "Hono echo, one process",
      ratio: round(r.median),
      spread: [round(r.spread[0]), round(r.spread[1])],
      ...(guarded ? { target: `≥ ${GUARD}`, pass: r.median >= GUARD } : {}),
    });
    const p99 = median(ls.map((l) => l.p99Ms));
    rows.push({
      part: "http",
      metric: `${t.name} p99 (median of ${rounds})`,
      value: p99,
      unit: "ms",
      target: "≤ 20",
      pass: p99 <= 20,
    });
    const bad = ls.reduce((s, l) => s + l.errors + l.timeouts + l.non2xx, 0);
    rows.push({
      part: "http",
      metric: `${t.name} errors + timeouts + non-2xx`,
      value: bad,
      unit: "",
      target: "0",
      pass: bad === 0,
    });
  }
  return { rows, details: { seconds, rounds, connections: 32, logLevel, runs: got } };
}
