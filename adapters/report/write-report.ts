import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { reviewOutput } from "../../contracts/review.js";
import { slug } from "./format.js";
import { type ReviewReport, renderReviewReport } from "./review-report.js";
import { renderBridgeAcReport } from "./bridge-report.js";
import { bridgeAcOutput } from "../../contracts/bridge.js";

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
export function writeReviewReport(dir: string, name: string, result: unknown, id?: string | number): WrittenReport {
  const base = slug(name);
  return writeReport(dir, base, renderReviewReport(reviewOutput.parse(result), { ...(id === undefined ? {} : { id }), svgDir: `${base}-charts` }));
}

/** The same for a bridgeAc result: `<name>.html`, `<name>.md`, `<name>-charts/*.svg`. */
export function writeBridgeAcReport(dir: string, name: string, result: unknown, id?: string | number): WrittenReport {
  const base = slug(name);
  return writeReport(dir, base, renderBridgeAcReport(bridgeAcOutput.parse(result), { ...(id === undefined ? {} : { id }), svgDir: `${base}-charts` }));
}

function writeReport(dir: string, base: string, report: ReviewReport): WrittenReport {
  const svgDir = join(dir, `${base}-charts`);
  mkdirSync(svgDir, { recursive: true });
  let bytes = 0;
  for (const s of report.svgs) {
    writeFileSync(join(svgDir, s.file), s.svg);
    bytes += Buffer.byteLength(s.svg);
  }
  const html = join(dir, `${base}.html`);
  const markdown = join(dir, `${base}.md`);
  writeFileSync(html, report.html);
  writeFileSync(markdown, report.markdown);
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
