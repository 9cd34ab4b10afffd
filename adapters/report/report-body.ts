import { bridgeAcOutput } from "../../contracts/bridge.js";
import type { ErrorBody } from "../../contracts/outcome.js";
import { reviewOutput } from "../../contracts/review.js";
import { renderBridgeAcReport } from "./bridge-report.js";
import { type ReportOptions, renderReviewReport } from "./review-report.js";
import { reportFailed } from "./write-report.js";

/** What a report needs of its procedure: the input flag that asks for the chart data, and the renderer. */
export interface ReportRenderer {
  readonly flag: string;
  readonly render: (result: unknown, opts: ReportOptions) => { readonly html: string; readonly markdown: string };
}

/** The procedures with a report (`POST /v1/<procedure>/report`, batch `--report-dir`). */
export const REPORT_RENDERERS: Readonly<Record<string, ReportRenderer>> = {
  review: { flag: "curves", render: (result, opts) => renderReviewReport(reviewOutput.parse(result), opts) },
  bridgeAc: { flag: "waveform", render: (result, opts) => renderBridgeAcReport(bridgeAcOutput.parse(result), opts) },
};

export type ReportFormat = "html" | "markdown" | "json";

/** A result as the text of its report in `format` (JSON: the result itself), or the error of a report that could not be drawn. */
export function reportBody(
  procedure: string,
  result: unknown,
  format: ReportFormat,
  id: string | number | undefined,
): { ok: true; text: string } | { ok: false; error: ErrorBody } {
  if (format === "json") return { ok: true, text: JSON.stringify(result) };
  const renderer = REPORT_RENDERERS[procedure];
  if (renderer === undefined) throw new Error(`no report for ${procedure}`);
  try {
    const report = renderer.render(result, id === undefined ? { svgDir: null } : { id, svgDir: null });
    return { ok: true, text: format === "html" ? report.html : report.markdown };
  } catch (e) {
    return { ok: false, error: reportFailed(procedure, e) };
  }
}
