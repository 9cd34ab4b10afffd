/**
 * A/B of builds of the server on single /v1/operatingPoint calls, like for like: each build one
 * server process as `npm start` runs it, beside the one-process Hono echo of the http part, the same
 * body, 32 connections, autocannon in a process of its own. All take turns in every round (the
 * order rotates round by round), and each ratio is the median of the rounds' paired ratios with
 * their spread: each build against the echo, and each against the first build. A script, not a
 * test, and not a part of `npm run bench`: the other builds are of other commits, made by hand
 * (check the commit out, `npm run build`, copy `dist/bundle` to e.g. `dist/bundle-before`, come
 * back and build again), named by BENCH_BUILDS as `name=main.js,name=main.js` (default: before =
 * dist/bundle-before/main.js, after = dist/bundle/main.js, this tree's build).
 *
 * Run: npm run build && tsc -p tsconfig.bench.json && node dist/bench/record-ab.js
 * (BENCH_ROUNDS, default 5; BENCH_HTTP_SECONDS, default 5). Prints one JSON document. Beside the
 * rates, each server's CPU time a request (user and system, all its threads, from /proc on Linux;
 * warm-up included): on a host shared with other jobs it moves less with their load than a rate.
 */
import { existsSync, readFileSync } from "node:fs";
import { loadavg } from "node:os";
import { type Load, dist, drive, log, MAIN, startServer, stop } from "./lib/processes.js";
import { opJson } from "./lib/payloads.js";
import { median, pairedRatio, round } from "./lib/stats.js";

const seconds = Number(process.env.BENCH_HTTP_SECONDS ?? 5);
const rounds = Number(process.env.BENCH_ROUNDS ?? 5);
const builds = (process.env.BENCH_BUILDS ?? `before=${dist("bundle-before", "main.js")},after=${MAIN}`)
  .split(",")
  .map((b) => {
    const [name, main] = b.split("=");
    if (!name || !main) throw new Error(`BENCH_BUILDS: "${b}" is not name=path/to/main.js`);
    return { name, main };
  });

const servers = await Promise.all([
  startServer(dist("bench", "lib", "echo-hono.js")),
  ...builds.map((b) => startServer(b.main, { LOG_LEVEL: "info" })),
]);
const targets = [
  { name: "echo", path: "/echo" },
  ...builds.map((b) => ({ name: b.name, path: "/v1/operatingPoint" })),
].map((t, i) => ({ ...t, base: servers[i]?.base ?? "" }));
/** user and system CPU seconds of a process so far (Linux /proc; undefined elsewhere) */
function cpuSeconds(pid: number | undefined): [number, number] | undefined {
  const file = `/proc/${pid}/stat`;
  if (pid === undefined || !existsSync(file)) return undefined;
  const f = readFileSync(file, "utf8").split(") ")[1]?.split(" ") ?? [];
  return [Number(f[11]) / 100, Number(f[12]) / 100]; // utime, stime in clock ticks (USER_HZ = 100)
}
const cpuUs: Record<string, { user: number; system: number }[]> = {};
const got: Record<string, Load[]> = {};
const loads: number[][] = [];
try {
  for (let r = 0; r < rounds; r += 1) {
    loads.push(loadavg().map((x) => round(x)));
    for (let i = 0; i < targets.length; i += 1) {
      const t = targets[(i + r) % targets.length];
      if (t === undefined) continue;
      log(`record A/B: ${t.name}, round ${r + 1}/${rounds}`);
      const pid = servers[targets.indexOf(t)]?.child.pid;
      const c0 = cpuSeconds(pid);
      const l = await drive(t.base, [{ path: t.path, body: opJson }], 32, seconds);
      const c1 = cpuSeconds(pid);
      got[t.name] = [...(got[t.name] ?? []), l];
      if (c0 && c1 && l.totalRequests > 0) {
        const per = (i: 0 | 1) => Math.round(((c1[i] - c0[i]) * 1e6) / l.totalRequests);
        cpuUs[t.name] = [...(cpuUs[t.name] ?? []), { user: per(0), system: per(1) }];
      }
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
const first = builds[0]?.name ?? "";
process.stdout.write(
  `${JSON.stringify(
    {
      builds,
      seconds,
      rounds,
      connections: 32,
      loadAverageEachRound: loads,
      ratesReqPerS: Object.fromEntries(targets.map((t) => [t.name, rates(t.name)])),
      medianReqPerS: Object.fromEntries(targets.map((t) => [t.name, Math.round(median(rates(t.name)))])),
      p99Ms: Object.fromEntries(targets.map((t) => [t.name, median((got[t.name] ?? []).map((l) => l.p99Ms))])),
      cpuUsPerRequest: cpuUs,
      medianCpuUsPerRequest: Object.fromEntries(
        Object.entries(cpuUs).map(([k, v]) => [k, Math.round(median(v.map((x) => x.user + x.system)))]),
      ),
      errorsTimeoutsNon2xx: Object.fromEntries(targets.map((t) => [t.name, bad(t.name)])),
      toEcho: Object.fromEntries(builds.map((b) => [b.name, ratio(b.name, "echo")])),
      [`to ${first}`]: Object.fromEntries(builds.slice(1).map((b) => [b.name, ratio(b.name, first)])),
    },
    null,
    1,
  )}\n`,
);
