/**
 * `npm run bench`: every benchmark of backstop side by side in one run, as ratios against a
 * baseline measured in the same run (the machine is shared and noisy) with the absolute figures
 * beside them. Prints a table and writes bench/results.json. A script, not a test: each part is
 * bounded in time (the whole run takes a few minutes); BENCH_QUICK=1 shortens every part.
 *
 * Parts: HTTP overhead (/v1 and /trpc against a bare Hono and a bare node:http JSON echo,
 * autocannon from a second process, 32 connections), the heavy review over HTTP against the same
 * reviews in process on one core, bulk /v1 of 1,000 operating points, batch of a generated JSON
 * Lines file against a parse-and-re-serialise pass-through (alternating runs, the best of each;
 * with peak RSS of the child), start-up to /readyz, and the existing analysis benches (AC bridge
 * vs ngspice, review, rule evaluation).
 */
import { type ChildProcess, execFileSync, spawn } from "node:child_process";
import { createWriteStream, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { availableParallelism, cpus, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { procedureInvoker } from "../adapters/batch/run-batch.js";
import { loadCatalogFile } from "../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG, projectRoot } from "../adapters/project-root.js";

const root = projectRoot();
const quick = process.env.BENCH_QUICK === "1";
const dist = (...p: string[]) => join(root, "dist", ...p);
const MAIN = dist("bundle", "main.js"); // what `npm start` runs
const RSS_PRELOAD = dist("bench", "lib", "max-rss.js");

interface Row {
  readonly part: string;
  readonly metric: string;
  readonly value: number;
  readonly unit: string;
  readonly baseline?: string;
  readonly ratio?: number;
  readonly target?: string;
  readonly pass?: boolean;
}
const rows: Row[] = [];
const details: Record<string, unknown> = {};
const round = (x: number, d = 2) => Number(x.toFixed(d));
const log = (s: string) => process.stderr.write(`${s}\n`);

// ---------------------------------------------------------------- processes
interface Server {
  readonly child: ChildProcess;
  readonly base: string;
  readonly output: string[];
}
function startServer(script: string, env: Record<string, string> = {}): Promise<Server> {
  const child = spawn(process.execPath, [script], { env: { ...process.env, PORT: "0", HOST: "127.0.0.1", LOG_LEVEL: "info", ...env }, stdio: ["ignore", "pipe", "pipe"] });
  const output: string[] = [];
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${script} did not start: ${output.join("").slice(-2000)}`)), 30_000);
    child.stdout?.on("data", (d: Buffer) => {
      // keep only the start of the log: the request lines are not needed and would grow without bound
      if (output.length < 50) output.push(String(d));
      const m = /listening on http:\/\/localhost:(\d+)/.exec(output.join(""));
      if (m) {
        clearTimeout(timer);
        resolve({ child, base: `http://127.0.0.1:${m[1]}`, output });
      }
    });
    child.stderr?.on("data", (d: Buffer) => output.length < 50 && output.push(String(d)));
    child.once("exit", (code) => reject(new Error(`${script} exited ${code}: ${output.join("").slice(-2000)}`)));
  });
}
async function stop(s: Server): Promise<void> {
  if (s.child.exitCode !== null) return;
  const gone = new Promise<void>((r) => s.child.once("exit", () => r()));
  s.child.kill("SIGTERM");
  const t = setTimeout(() => s.child.kill("SIGKILL"), 10_000);
  await gone;
  clearTimeout(t);
}

interface Load {
  readonly requestsPerSecond: number;
  readonly totalRequests: number;
  readonly p50Ms: number;
  readonly p99Ms: number;
  readonly maxMs: number;
  readonly errors: number;
  readonly timeouts: number;
  readonly non2xx: number;
}
/** autocannon in its own process (see lib/load-driver.ts). */
function drive(base: string, bodies: { path: string; body: string }[], connections: number, durationS: number, warmupS = 1): Promise<Load> {
  const specDir = mkdtempSync(join(tmpdir(), "backstop-load-"));
  const spec = join(specDir, "spec.json");
  writeFileSync(spec, JSON.stringify({ url: base, connections, durationS, warmupS, bodies, timeoutS: 30 }));
  return new Promise<Load>((resolve, reject) => {
    const child = spawn(process.execPath, [dist("bench", "lib", "load-driver.js"), spec], { stdio: ["ignore", "pipe", "inherit"] });
    let out = "";
    child.stdout.on("data", (d: Buffer) => {
      out += String(d);
    });
    child.once("exit", (code) => (code === 0 ? resolve(JSON.parse(out.trim().split("\n").at(-1) ?? "{}") as Load) : reject(new Error(`load driver exited ${code}`))));
  }).finally(() => rmSync(specDir, { recursive: true, force: true }));
}

function runNode(args: string[], env: Record<string, string> = {}): Promise<{ code: number | null; stdout: string; stderr: string; wallMs: number }> {
  const t0 = performance.now();
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, { env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d: Buffer) => {
      stdout += String(d);
    });
    child.stderr.on("data", (d: Buffer) => {
      stderr += String(d);
    });
    child.once("exit", (code) => resolve({ code, stdout, stderr, wallMs: performance.now() - t0 }));
  });
}

// ---------------------------------------------------------------- payloads
const opBody = readFileSync(join(root, "examples", "http", "operatingPoint.body.json"), "utf8");
const opInput = JSON.parse(opBody) as Record<string, unknown>;
const opJson = JSON.stringify(opInput);
const reviewInput = (JSON.parse(readFileSync(join(root, "examples", "requests", "review.json"), "utf8")) as { input: unknown }).input;
const reviewJson = JSON.stringify(reviewInput);
const PARTS = ["demo-schottky-10a-60v", "demo-pfet-40v-12mohm", "demo-ideal-diode-60v-3mohm", "demo-integrated-ideal-diode-5a-36v", "demo-schottky-5a-45v"];
/** a deterministic operating-point case k (part, current, ambient vary) */
function opCase(k: number): Record<string, unknown> {
  return {
    stage: { kind: "catalog-part", partId: PARTS[k % PARTS.length] },
    supplyV: 12 + (k % 7),
    sourceResistanceOhm: 0.02,
    load: { kind: "constant-current", currentA: 0.5 + (k % 11) * 0.25 },
    ambientC: -40 + (k % 13) * 10,
  };
}

// ---------------------------------------------------------------- parts
async function httpOverhead(): Promise<void> {
  const seconds = quick ? 2 : 5;
  const rounds = quick ? 1 : 2;
  const echoNode = await startServer(dist("bench", "lib", "echo-node.js"));
  const echoHono = await startServer(dist("bench", "lib", "echo-hono.js"));
  // as `npm start` runs it (BACKSTOP_HTTP_PROCESSES=auto: one HTTP process per CPU), and as one process
  const backstop = await startServer(MAIN, { LOG_LEVEL: process.env.BENCH_LOG_LEVEL ?? "info" });
  const lone = await startServer(MAIN, { LOG_LEVEL: process.env.BENCH_LOG_LEVEL ?? "info", BACKSTOP_HTTP_PROCESSES: "1" });
  const targets = [
    { name: "node:http echo", base: echoNode.base, path: "/echo" },
    { name: "Hono echo", base: echoHono.base, path: "/echo" },
    { name: "/v1/operatingPoint", base: backstop.base, path: "/v1/operatingPoint" },
    { name: "/trpc/operatingPoint", base: backstop.base, path: "/trpc/operatingPoint" },
    { name: "/v1/operatingPoint, one HTTP process", base: lone.base, path: "/v1/operatingPoint" },
    { name: "/trpc/operatingPoint, one HTTP process", base: lone.base, path: "/trpc/operatingPoint" },
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
    await Promise.all([stop(echoNode), stop(echoHono), stop(backstop), stop(lone)]);
  }
  const agg = (name: string) => {
    const ls = got[name] ?? [];
    return {
      rate: ls.reduce((s, l) => s + l.requestsPerSecond, 0) / ls.length,
      p99: Math.max(...ls.map((l) => l.p99Ms)),
      errors: ls.reduce((s, l) => s + l.errors + l.timeouts, 0),
      non2xx: ls.reduce((s, l) => s + l.non2xx, 0),
    };
  };
  details.http = got;
  const hono = agg("Hono echo");
  const node = agg("node:http echo");
  for (const t of targets) {
    const a = agg(t.name);
    const isV1 = t.name === "/v1/operatingPoint";
    rows.push({
      part: "http",
      metric: `${t.name} rate (32 conns)`,
      value: Math.round(a.rate),
      unit: "req/s",
      baseline: "Hono echo",
      ratio: round(a.rate / hono.rate),
      ...(isV1 ? { target: "≥ 0.5", pass: a.rate / hono.rate >= 0.5 } : {}),
    });
    rows.push({ part: "http", metric: `${t.name} p99`, value: a.p99, unit: "ms", target: "≤ 20", pass: a.p99 <= 20 });
    rows.push({ part: "http", metric: `${t.name} errors + non-2xx`, value: a.errors + a.non2xx, unit: "", target: "0", pass: a.errors + a.non2xx === 0 });
  }
  rows.push({ part: "http", metric: "Hono echo vs node:http echo", value: Math.round(hono.rate), unit: "req/s", baseline: "node:http echo", ratio: round(hono.rate / node.rate) });
}

async function reviewOverHttp(): Promise<void> {
  const seconds = quick ? 2 : 5;
  const invoke = procedureInvoker({ catalog: loadCatalogFile(DEMO_CATALOG()) })("review");
  if (invoke === undefined) throw new Error("no review procedure");
  for (let i = 0; i < 5; i += 1) await invoke(reviewInput);
  let n = 0;
  const t0 = performance.now();
  while (performance.now() - t0 < seconds * 1000) {
    await invoke(reviewInput);
    n += 1;
  }
  const inProcess = (n * 1000) / (performance.now() - t0);
  // one compute thread: the same one core as the loop above; the main thread only does HTTP
  const s = await startServer(MAIN, { BACKSTOP_WORKERS: "1" });
  let v1: Load;
  try {
    log("review over /v1, 1 worker thread");
    v1 = await drive(s.base, [{ path: "/v1/review", body: reviewJson }], 4, seconds);
  } finally {
    await stop(s);
  }
  details.review = { inProcessPerSecond: inProcess, v1 };
  rows.push({ part: "review", metric: "review in process, one core", value: round(inProcess, 1), unit: "reviews/s" });
  rows.push({ part: "review", metric: "review over /v1 (1 compute thread, 4 conns)", value: round(v1.requestsPerSecond, 1), unit: "reviews/s", baseline: "in process", ratio: round(v1.requestsPerSecond / inProcess), target: "≥ 0.8", pass: v1.requestsPerSecond / inProcess >= 0.8 });
  rows.push({ part: "review", metric: "review over /v1 errors + non-2xx", value: v1.errors + v1.timeouts + v1.non2xx, unit: "", target: "0", pass: v1.errors + v1.timeouts + v1.non2xx === 0 });
}

async function bulk(): Promise<void> {
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
  details.bulk = l;
  const points = l.requestsPerSecond * 1000;
  rows.push({ part: "bulk", metric: `bulk /v1 of 1,000 operating points (${availableParallelism()} cores)`, value: Math.round(points), unit: "points/s", target: "≥ 50,000", pass: points >= 50_000 });
  rows.push({ part: "bulk", metric: "bulk request p99", value: l.p99Ms, unit: "ms" });
  rows.push({ part: "bulk", metric: "bulk errors + non-2xx", value: l.errors + l.timeouts + l.non2xx, unit: "", target: "0", pass: l.errors + l.timeouts + l.non2xx === 0 });
}

async function batch(): Promise<void> {
  const lines = Number(process.env.BENCH_BATCH_LINES ?? (quick ? 100_000 : 1_000_000));
  const dir = mkdtempSync(join(tmpdir(), "backstop-bench-"));
  try {
    const input = join(dir, "in.jsonl");
    const out = createWriteStream(input);
    for (let k = 0; k < lines; k += 1) {
      if (!out.write(`${JSON.stringify({ id: k, procedure: "operatingPoint", input: opCase(k) })}\n`)) await new Promise<void>((r) => out.once("drain", () => r()));
    }
    await new Promise<void>((r) => out.end(() => r()));
    const rssOf = (file: string) => Math.max(...readFileSync(file, "utf8").trim().split("\n").map((l) => (JSON.parse(l) as { maxRssKB: number }).maxRssKB)) / 1024;
    // Alternating runs (pass-through, batch, pass-through, batch, ...), each side's best: the
    // machine is shared, and one outside burst during one run would otherwise set the ratio.
    const rounds = quick ? 1 : 2;
    const passMs: number[] = [];
    const batchMs: number[] = [];
    const passRss: number[] = [];
    const batchRss: number[] = [];
    let batchStderr = "";
    for (let r = 0; r < rounds; r += 1) {
      log(`batch: pass-through of ${lines} lines (round ${r + 1} of ${rounds})`);
      const passRssFile = join(dir, `pass-${r}.rss`);
      const pass = await runNode(["--import", RSS_PRELOAD, dist("bench", "lib", "batch-passthrough.js"), input, join(dir, `pass-${r}.jsonl`)], { BENCH_RSS_FILE: passRssFile });
      if (pass.code !== 0) throw new Error(`pass-through failed: ${pass.stderr}`);
      rmSync(join(dir, `pass-${r}.jsonl`), { force: true });
      log(`batch: backstop batch of ${lines} lines (round ${r + 1} of ${rounds})`);
      const batchRssFile = join(dir, `batch-${r}.rss`);
      const run = await runNode(["--import", RSS_PRELOAD, join(root, "bin", "backstop.mjs"), "batch", "--in", input, "--out", join(dir, `out-${r}.jsonl`)], { BENCH_RSS_FILE: batchRssFile, BACKSTOP_PROGRESS_MS: "60000" });
      if (run.code !== 0) throw new Error(`batch failed (${run.code}): ${run.stderr}`);
      rmSync(join(dir, `out-${r}.jsonl`), { force: true });
      passMs.push(pass.wallMs);
      batchMs.push(run.wallMs);
      passRss.push(rssOf(passRssFile));
      batchRss.push(rssOf(batchRssFile));
      batchStderr = run.stderr.trim().split("\n").at(-1) ?? "";
    }
    const passRate = (lines * 1000) / Math.min(...passMs);
    const batchRate = (lines * 1000) / Math.min(...batchMs);
    const peak = Math.max(...batchRss);
    details.batch = { lines, rounds, passThroughMs: passMs, batchMs, passThroughRssMB: passRss, batchRssMB: batchRss, batchStderr };
    rows.push({ part: "batch", metric: `pass-through (parse + re-serialise), ${lines.toLocaleString("en-US")} lines, best of ${rounds}`, value: Math.round(passRate), unit: "lines/s" });
    rows.push({ part: "batch", metric: `backstop batch, default workers, best of ${rounds}`, value: Math.round(batchRate), unit: "lines/s", baseline: "pass-through", ratio: round(batchRate / passRate), target: "≥ 0.4", pass: batchRate / passRate >= 0.4 });
    rows.push({ part: "batch", metric: "backstop batch peak RSS (process, all threads)", value: round(peak, 0), unit: "MB", target: "≤ 300", pass: peak <= 300 });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function startUp(): Promise<void> {
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
  ms.sort((a, b) => a - b);
  const median = ms[Math.floor(ms.length / 2)] as number;
  details.startUp = { ms };
  rows.push({ part: "start-up", metric: `process start to /readyz 200 (median of ${runs})`, value: round(median, 0), unit: "ms", target: "≤ 500", pass: median <= 500 });
}

async function analyses(): Promise<void> {
  log("analyses: bench/review.ts");
  const rv = await runNode([dist("bench", "review.js")]);
  if (rv.code === 0) {
    const j = JSON.parse(rv.stdout.trim().split("\n").at(-1) ?? "{}") as { review: { perSecond: number; msEach: number }; monteCarlo: { msEach: number } };
    details.reviewBench = j;
    rows.push({ part: "analyses", metric: "review, 4 candidates × 24 corners, one core", value: round(j.review.perSecond, 0), unit: "reviews/s", target: "≥ 2,000 (issue 4)", pass: j.review.perSecond >= 2000 });
    rows.push({ part: "analyses", metric: "Monte Carlo, 10,000 samples", value: round(j.monteCarlo.msEach, 1), unit: "ms", target: "≤ 100", pass: j.monteCarlo.msEach <= 100 });
  } else rows.push({ part: "analyses", metric: `review bench failed: ${rv.stderr.slice(0, 200)}`, value: Number.NaN, unit: "", pass: false });

  log("analyses: bench/rules-eval.ts");
  const re = await runNode([dist("bench", "rules-eval.js")]);
  if (re.code === 0) {
    const j = JSON.parse(re.stdout.trim().split("\n").at(-1) ?? "{}") as { rules: number; recordsPerSecondFullVerdicts: number; recordsPerSecondMathjsEvaluate: number; target: number };
    details.rulesBench = j;
    rows.push({ part: "analyses", metric: `rule evaluation, ${j.rules} rules, full verdicts`, value: j.recordsPerSecondFullVerdicts, unit: "records/s", baseline: "mathjs evaluate", ratio: round(j.recordsPerSecondFullVerdicts / j.recordsPerSecondMathjsEvaluate, 1), target: "≥ 200,000", pass: j.recordsPerSecondFullVerdicts >= 200_000 });
  } else rows.push({ part: "analyses", metric: `rules bench failed: ${re.stderr.slice(0, 200)}`, value: Number.NaN, unit: "", pass: false });

  let hasNgspice = true;
  try {
    execFileSync("ngspice", ["--version"], { stdio: "ignore" });
  } catch {
    hasNgspice = false;
  }
  if (!hasNgspice) {
    rows.push({ part: "analyses", metric: "AC bridge vs ngspice: ngspice not installed, skipped", value: Number.NaN, unit: "" });
    return;
  }
  log("analyses: bench/bridge-ac-vs-ngspice.ts");
  const br = await runNode([dist("bench", "bridge-ac-vs-ngspice.js")]);
  const file = join(root, "bench", "out", "bridge-ac-vs-ngspice.json");
  if (br.code === 0 && existsSync(file)) {
    type Timed = { ms: { best: number; median: number }; maxStep: string; periods: number; maxRelVsReference: number; ratio: { best: number; median: number } };
    const cases = JSON.parse(readFileSync(file, "utf8")) as { case: string; ours: { ms: { best: number; median: number }; maxRelVsReference: number }; ngspiceWithin0p1Percent: Timed; ngspiceAsAccurateAsOurs: Timed }[];
    details.bridgeAc = cases;
    for (const c of cases) {
      const ours = c.ours.ms;
      const bar = (label: string, n: Timed): Row => ({
        part: "analyses",
        metric: `AC bridge ${c.case}: ngspice ${label} (${n.maxStep}, ${n.periods} periods, ${n.ms.best} ms) / ours (${round(ours.best, 3)} ms), best`,
        value: n.ratio.best,
        unit: "×",
        baseline: "ngspice",
        target: "≥ 100",
        pass: n.ratio.best >= 100,
      });
      rows.push(bar("as accurate as ours", c.ngspiceAsAccurateAsOurs));
      rows.push(bar("within 0.1 %", c.ngspiceWithin0p1Percent));
      rows.push({ part: "analyses", metric: `AC bridge ${c.case}: ours vs a 60-period ngspice reference, worst of Vdc, ripple, element RMS and loss`, value: round(100 * c.ours.maxRelVsReference, 3), unit: "%", target: "≤ 1", pass: c.ours.maxRelVsReference <= 0.01 });
    }
  } else rows.push({ part: "analyses", metric: `bridge bench failed: ${br.stderr.slice(0, 200)}`, value: Number.NaN, unit: "", pass: false });
}

// ---------------------------------------------------------------- run
const only = process.env.BENCH_ONLY?.split(",");
const parts: [string, () => Promise<void>][] = [
  ["http", httpOverhead],
  ["review", reviewOverHttp],
  ["bulk", bulk],
  ["batch", batch],
  ["start-up", startUp],
  ["analyses", analyses],
];
const loadStart = loadavg();
const t0 = performance.now();
const partSeconds: Record<string, number> = {};
for (const [name, f] of parts) {
  if (only && !only.includes(name)) continue;
  const ts = performance.now();
  try {
    await f();
  } catch (e) {
    rows.push({ part: name, metric: `failed: ${(e as Error).message.slice(0, 300)}`, value: Number.NaN, unit: "", pass: false });
  }
  partSeconds[name] = round((performance.now() - ts) / 1000, 1);
}
const loadEnd = loadavg();

const fmt = (v: number) => (Number.isNaN(v) ? "—" : v.toLocaleString("en-US", { maximumFractionDigits: 3 }));
const header = ["part", "metric", "value", "unit", "vs", "ratio", "target", "ok"];
const table = rows.map((r) => [r.part, r.metric, fmt(r.value), r.unit, r.baseline ?? "", r.ratio === undefined ? "" : String(r.ratio), r.target ?? "", r.pass === undefined ? "" : r.pass ? "yes" : "NO"]);
const widths = header.map((h, i) => Math.max(h.length, ...table.map((t) => (t[i] as string).length)));
const line = (cells: string[]) => cells.map((c, i) => (i === 2 || i === 5 ? c.padStart(widths[i] as number) : c.padEnd(widths[i] as number))).join("  ");
process.stdout.write(`${line(header)}\n${widths.map((w) => "-".repeat(w)).join("  ")}\n${table.map(line).join("\n")}\n`);
const machine = { cores: availableParallelism(), cpu: cpus()[0]?.model ?? "unknown", node: process.version, loadAverageAtStart: loadStart.map((x) => round(x)), loadAverageAtEnd: loadEnd.map((x) => round(x)) };
process.stdout.write(`\nmachine: ${machine.cores} cores, ${machine.cpu}, node ${machine.node}; load average ${machine.loadAverageAtStart.join(" ")} at start, ${machine.loadAverageAtEnd.join(" ")} at end; ${round((performance.now() - t0) / 1000, 0)} s\n`);
mkdirSync(join(root, "bench"), { recursive: true });
if (!only) writeFileSync(join(root, "bench", "results.json"), `${JSON.stringify({ machine, seconds: partSeconds, rows, details }, null, 2)}\n`);
