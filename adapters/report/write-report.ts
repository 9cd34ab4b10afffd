import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { type FileOps, writeFileAtomic } from "../atomic-file.js";
import { reviewOutput } from "../../contracts/review.js";
import { slug } from "./format.js";
import { type ReviewReport, renderReviewReport } from "./review-report.js";
import { renderBridgeAcReport } from "./bridge-report.js";
import { bridgeAcOutput } from "../../contracts/bridge.js";
import type { ErrorBody } from "../../contracts/outcome.js";

export interface WrittenReport {
  readonly html: string;
  readonly markdown: string;
  readonly svgDir: string;
  readonly svgCount: number;
  readonly bytes: number;
}

/**
 * Write one review's report into `dir`: `<name>.html` (self-contained), `<name>.md` and the charts
 * as `<name>-charts/*.svg` (linked from the Markdown). `result` is a review result as a procedure
 * returned it; it is checked against the output contract first (a mismatch is a bug, so it throws).
 */
export function writeReviewReport(
  dir: string,
  name: string,
  result: unknown,
  id?: string | number,
  ops?: FileOps,
): WrittenReport {
  const base = slug(name);
  return writeReport(
    dir,
    base,
    renderReviewReport(reviewOutput.parse(result), { ...(id === undefined ? {} : { id }), svgDir: `${base}-charts` }),
    ops,
  );
}

/** The same for a bridgeAc result: `<name>.html`, `<name>.md`, `<name>-charts/*.svg`. */
export function writeBridgeAcReport(
  dir: string,
  name: string,
  result: unknown,
  id?: string | number,
  ops?: FileOps,
): WrittenReport {
  const base = slug(name);
  return writeReport(
    dir,
    base,
    renderBridgeAcReport(bridgeAcOutput.parse(result), {
      ...(id === undefined ? {} : { id }),
      svgDir: `${base}-charts`,
    }),
    ops,
  );
}

/** Each file written whole under its name (writeFileAtomic): a batch killed mid-report leaves no torn file behind a final name. */
function writeReport(dir: string, base: string, report: ReviewReport, ops?: FileOps): WrittenReport {
  const svgDir = join(dir, `${base}-charts`);
  mkdirSync(svgDir, { recursive: true });
  let bytes = 0;
  for (const s of report.svgs) {
    writeFileAtomic(join(svgDir, s.file), s.svg, ops);
    bytes += Buffer.byteLength(s.svg);
  }
  const html = join(dir, `${base}.html`);
  const markdown = join(dir, `${base}.md`);
  writeFileAtomic(html, report.html, ops);
  writeFileAtomic(markdown, report.markdown, ops);
  bytes += Buffer.byteLength(report.html) + Buffer.byteLength(report.markdown);
  return { html, markdown, svgDir, svgCount: report.svgs.length, bytes };
}

/** File names for a batch run's reports: the row's id, else `line-<n>`; a repeated id gets `-line<n>`. */
export function reportNamer(): (id: string | number | null, line: number) => string {
  const used = new Set<string>();
  return (id, line) => {
    let name = id === null ? `line-${line}` : slug(String(id));
    if (used.has(name)) name = `${name}-line${line}`;
    used.add(name);
    return name;
  };
}

/** The error of a result that could not be drawn as a report (batch: that line's error row; HTTP: 422). */
export function reportFailed(procedure: string, e: unknown): ErrorBody {
  const message = `the ${procedure} result was computed but its report could not be drawn (${e instanceof Error ? e.message : String(e)}); ask for the result as JSON`;
  return { code: "report-failed", message, issues: [{ path: [], message }] };
}
