import { createReadStream, readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { Writable } from "node:stream";
import type { OperatingPointOutput } from "../../contracts/operating-point.js";
import { CAUTION } from "../../domain/provenance.js";
import { loadCatalogFile } from "../catalog/file-catalog.js";
import { DEMO_CATALOG, projectRoot } from "../project-root.js";
import { writeReviewReport } from "../report/write-report.js";
import { type BatchOutputLine, procedureInvoker, runBatch } from "./run-batch.js";

/** `npm run demo`: the batch mode on the invented demo scenarios, printed as a readable table. */
async function demo(): Promise<void> {
  const file = join(projectRoot(), "examples", "demo", "operating-points.jsonl");
  const rows: BatchOutputLine[] = [];
  const sink = new Writable({
    write(chunk, _enc, done) {
      for (const line of String(chunk).split("\n")) if (line) rows.push(JSON.parse(line) as BatchOutputLine);
      done();
    },
  });
  const counts = await runBatch(createReadStream(file), sink, { catalog: loadCatalogFile(DEMO_CATALOG()) });
  const out: string[] = [`backstop demo: ${file}`, ""];
  out.push(
    [
      "scenario / part".padEnd(68),
      "outcome".padEnd(17),
      "mode".padEnd(19),
      "drop V".padStart(8),
      "loss W".padStart(8),
      "Tj °C".padStart(7),
      "load V".padStart(8),
    ].join(" "),
  );
  for (const r of rows) {
    if (!r.ok) {
      out.push(`${String(r.id).padEnd(68)} error: ${r.error.message}`);
      continue;
    }
    const res = r.result as OperatingPointOutput;
    const p = "point" in res ? res.point : undefined;
    out.push(
      [
        String(r.id).slice(0, 68).padEnd(68),
        res.outcome.padEnd(17),
        (p?.mode ?? "-").padEnd(19),
        (p ? p.dropV.toFixed(3) : "-").padStart(8),
        (p ? p.stageLossW.toFixed(3) : "-").padStart(8),
        (p ? p.tjC.toFixed(1) : "-").padStart(7),
        (p ? p.loadV.toFixed(2) : "-").padStart(8),
      ].join(" "),
    );
    if (!p && "reason" in res) out.push(`    ${res.reason}`);
  }
  out.push("", `${counts.lines} requests, ${counts.ok} answered, ${counts.failed} rejected.`, "");
  out.push(...(await demoReport()), "", CAUTION, "");
  process.stdout.write(out.join("\n"));
}

/** The example design review, rendered as a report into BACKSTOP_REPORT_DIR (default dist/demo-reports). */
async function demoReport(): Promise<string[]> {
  const file = join(projectRoot(), "examples", "requests", "review.json");
  const line = JSON.parse(readFileSync(file, "utf8")) as { id: string; input: unknown };
  const review = procedureInvoker({ catalog: loadCatalogFile(DEMO_CATALOG()) })("review");
  if (review === undefined) throw new Error("review procedure missing");
  const result = (await review({ ...(line.input as object), curves: true })) as {
    ranking: { rank: number; label: string; verdict: string }[];
  };
  const dir = resolve(process.env.BACKSTOP_REPORT_DIR ?? join(projectRoot(), "dist", "demo-reports"));
  const w = writeReviewReport(dir, line.id, result, line.id);
  return [
    `design review ${line.id} (${file}):`,
    ...result.ranking.map((r) => `  ${r.rank}. ${r.label.padEnd(40)} ${r.verdict}`),
    `report: ${w.html}`,
    `        ${w.markdown} (+ ${w.svgCount} SVG charts in ${w.svgDir})`,
  ];
}

await demo();
