/**
 * A/B of server builds, like for like, for a performance note or a second path in code: each build
 * is a `dist/bundle/main.js` (this tree's, or one built from a copy with the path taken out), and
 * a build may be given node options (`|--max-semi-space-size=4`: NODE_OPTIONS of its process). The
 * targets take turns in every round, as in the http part: the one-process Hono echo, then each
 * build's single `/v1/operatingPoint` and `/trpc/operatingPoint` calls (32 connections), then each
 * build's start-up (process start to `/readyz` 200). Ratios are the medians of the rounds' paired
 * ratios (to the echo; start-up to the first build) with their spread.
 *
 *   BENCH_AB="this=dist/bundle/main.js,no-inline=/tmp/v/dist/bundle/main.js" BENCH_AB_PART=http-ab \
 *     npm run bench:ab
 *
 * BENCH_ROUNDS (default 5) and BENCH_HTTP_SECONDS (default 5) as in `npm run bench`; the part's
 * entry in bench/results.json is replaced (the others are kept).
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { loadavg } from "node:os";
import { isAbsolute, join } from "node:path";
import { opJson } from "./lib/payloads.js";
import { dist, drive, type Load, log, root, type Server, startServer, stop } from "./lib/processes.js";
import { measuredOn, median, pairedRatio, round, type Row } from "./lib/stats.js";

const builds = (process.env.BENCH_AB ?? "")
  .split(",")
  .filter((s) => s !== "")
  .map((s) => {
    const at = s.indexOf("=");
    if (at < 1) throw new Error(`BENCH_AB: "${s}" is not name=path/to/main.js[|node options]`);
    const [path, nodeOptions] = s.slice(at + 1).split("|") as [string, string | undefined];
    const env: Record<string, string> = nodeOptions === undefined ? {} : { NODE_OPTIONS: nodeOptions };
    return { name: s.slice(0, at), main: isAbsolute(path) ? path : join(root, path), env };
  });
if (builds.length < 2) throw new Error("BENCH_AB: name two builds or more (name=path/to/main.js, comma separated)");
const part = process.env.BENCH_AB_PART ?? "http-ab";
const rounds = Number(process.env.BENCH_ROUNDS ?? 5);
const seconds = Number(process.env.BENCH_HTTP_SECONDS ?? 5);

async function startUpMs(main: string, env: Record<string, string>): Promise<number> {
  const t0 = performance.now();
  const s = await startServer(main, env);
  for (let k = 0; k < 5000; k += 1) {
    if (
      await fetch(`${s.base}/readyz`).then(
        (r) => r.status === 200,
        () => false,
      )
    )
      break;
    await new Promise((r) => setTimeout(r, 2));
  }
  const ms = performance.now() - t0;
  await stop(s);
  return ms;
}

const loadAverageAtStart = loadavg().map((x) => round(x));
const t0 = performance.now();
const echo = await startServer(dist("bench", "lib", "echo-hono.js"));
const servers: Server[] = [];
for (const b of builds) servers.push(await startServer(b.main, { LOG_LEVEL: "info", ...b.env }));
const rates: Record<string, Load[]> = {};
const starts: Record<string, number[]> = {};
const add = (k: string, l: Load) => {
  rates[k] = [...(rates[k] ?? []), l];
};
try {
  for (let r = 0; r < rounds; r += 1) {
    log(
      `${part}: round ${r + 1}/${rounds}, load average ${loadavg()
        .map((x) => round(x))
        .join(" ")}`,
    );
    add("echo", await drive(echo.base, [{ path: "/echo", body: opJson }], 32, seconds));
    for (const [i, b] of builds.entries()) {
      const s = servers[i] as Server;
      add(`${b.name} /v1`, await drive(s.base, [{ path: "/v1/operatingPoint", body: opJson }], 32, seconds));
      add(`${b.name} /trpc`, await drive(s.base, [{ path: "/trpc/operatingPoint", body: opJson }], 32, seconds));
    }
    for (const b of builds) starts[b.name] = [...(starts[b.name] ?? []), await startUpMs(b.main, b.env)];
  }
} finally {
  await Promise.all([echo, ...servers].map(stop));
}

const rps = (k: string) => (rates[k] ?? []).map((l) => l.requestsPerSecond);
const rows: Row[] = [
  {
    part,
    metric: `Hono echo, one process, 32 conns (median of ${rounds})`,
    value: Math.round(median(rps("echo"))),
    unit: "req/s",
  },
];
for (const b of builds) {
  for (const route of ["/v1", "/trpc"]) {
    const k = `${b.name} ${route}`;
    const r = pairedRatio(rps(k), rps("echo"));
    const bad = (rates[k] ?? []).reduce((s, l) => s + l.errors + l.timeouts + l.non2xx, 0);
    rows.push({
      part,
      metric: `${b.name}: ${route}/operatingPoint, one process, 32 conns (median of ${rounds} alternating runs; errors ${bad})`,
      value: Math.round(median(rps(k))),
      unit: "req/s",
      baseline: "Hono echo, one process",
      ratio: round(r.median),
      spread: [round(r.spread[0]), round(r.spread[1])],
    });
  }
}
const first = builds[0]?.name as string;
for (const b of builds) {
  const r = pairedRatio(starts[b.name] ?? [], starts[first] ?? []);
  rows.push({
    part,
    metric: `${b.name}: process start to /readyz 200 (median of ${rounds})`,
    value: round(median(starts[b.name] ?? []), 0),
    unit: "ms",
    baseline: first,
    ratio: round(r.median),
    spread: [round(r.spread[0]), round(r.spread[1])],
  });
}
const measured = {
  ...measuredOn(loadAverageAtStart, t0),
  builds: Object.fromEntries(builds.map((b) => [b.name, { main: b.main, ...b.env }])),
};
for (const r of rows)
  process.stdout.write(
    `${r.metric}: ${r.value} ${r.unit}${r.ratio === undefined ? "" : `, ${r.ratio} (${r.spread?.join("-")}) of ${r.baseline}`}\n`,
  );
process.stdout.write(
  `node ${process.version}; load average ${loadAverageAtStart.join(" ")} -> ${measured.loadAverageAtEnd.join(" ")}\n`,
);
const file = join(root, "bench", "results.json");
const all = existsSync(file)
  ? (JSON.parse(readFileSync(file, "utf8")) as { parts: Record<string, unknown> })
  : { parts: {} };
all.parts[part] = { measured, rows, details: { rounds, seconds, connections: 32, runs: rates, startUpMs: starts } };
writeFileSync(file, `${JSON.stringify(all, null, 2)}\n`);
