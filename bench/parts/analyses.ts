/** The analysis benches, each its own script: the review and Monte Carlo, rule evaluation, the AC bridge against ngspice. */
import { execFileSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { dist, log, root, runNode } from "../lib/processes.js";
import { type PartResult, round, type Row } from "../lib/stats.js";

export async function analyses(): Promise<PartResult> {
  const rows: Row[] = [];
  const details: Record<string, unknown> = {};
  log("analyses: bench/review.ts");
  const rv = await runNode([dist("bench", "review.js")]);
  if (rv.code === 0) {
    const j = JSON.parse(rv.stdout.trim().split("\n").at(-1) ?? "{}") as {
      review: { perSecond: number; msEach: number };
      monteCarlo: { msEach: number };
    };
    details.review = j;
    rows.push({
      part: "analyses",
      metric: "review, 4 candidates × 24 corners, one core",
      value: round(j.review.perSecond, 0),
      unit: "reviews/s",
      target: "≥ 2,000 (issue 4)",
      pass: j.review.perSecond >= 2000,
    });
    rows.push({
      part: "analyses",
      metric: "Monte Carlo, 10,000 samples",
      value: round(j.monteCarlo.msEach, 1),
      unit: "ms",
      target: "≤ 100",
      pass: j.monteCarlo.msEach <= 100,
    });
  } else
    rows.push({
      part: "analyses",
      metric: `review bench failed: ${rv.stderr.slice(0, 200)}`,
      value: Number.NaN,
      unit: "",
      pass: false,
    });

  log("analyses: bench/rules-eval.ts");
  const re = await runNode([dist("bench", "rules-eval.js")]);
  if (re.code === 0) {
    const j = JSON.parse(re.stdout.trim().split("\n").at(-1) ?? "{}") as {
      rules: number;
      recordsPerSecondFullVerdicts: number;
      recordsPerSecondMathjsEvaluate: number;
      target: number;
    };
    details.rules = j;
    rows.push({
      part: "analyses",
      metric: `rule evaluation, ${j.rules} rules, full verdicts`,
      value: j.recordsPerSecondFullVerdicts,
      unit: "records/s",
      baseline: "mathjs evaluate",
      ratio: round(j.recordsPerSecondFullVerdicts / j.recordsPerSecondMathjsEvaluate, 1),
      target: "≥ 200,000",
      pass: j.recordsPerSecondFullVerdicts >= 200_000,
    });
  } else
    rows.push({
      part: "analyses",
      metric: `rules bench failed: ${re.stderr.slice(0, 200)}`,
      value: Number.NaN,
      unit: "",
      pass: false,
    });

  let hasNgspice = true;
  try {
    execFileSync("ngspice", ["--version"], { stdio: "ignore" });
  } catch {
    hasNgspice = false;
  }
  if (!hasNgspice) {
    rows.push({
      part: "analyses",
      metric: "AC bridge vs ngspice: ngspice not installed, skipped",
      value: Number.NaN,
      unit: "",
    });
    return { rows, details };
  }
  log("analyses: bench/bridge-ac-vs-ngspice.ts");
  const br = await runNode([dist("bench", "bridge-ac-vs-ngspice.js")]);
  const file = join(root, "bench", "out", "bridge-ac-vs-ngspice.json");
  if (br.code === 0 && existsSync(file)) {
    type Timed = {
      ms: { best: number; median: number };
      maxStep: string;
      periods: number;
      maxRelVsReference: number;
      ratio: { best: number; median: number };
    };
    const cases = JSON.parse(readFileSync(file, "utf8")) as {
      case: string;
      ours: { ms: { best: number; median: number }; maxRelVsReference: number };
      ngspiceWithin0p1Percent: Timed;
      ngspiceAsAccurateAsOurs: Timed;
    }[];
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
      rows.push({
        part: "analyses",
        metric: `AC bridge ${c.case}: ours vs a 60-period ngspice reference, worst of Vdc, ripple, element RMS and loss`,
        value: round(100 * c.ours.maxRelVsReference, 3),
        unit: "%",
        target: "≤ 1",
        pass: c.ours.maxRelVsReference <= 0.01,
      });
    }
  } else
    rows.push({
      part: "analyses",
      metric: `bridge bench failed: ${br.stderr.slice(0, 200)}`,
      value: Number.NaN,
      unit: "",
      pass: false,
    });
  return { rows, details };
}
