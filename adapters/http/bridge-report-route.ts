import type { Hono } from "hono";
import { mountProcedureReport, type ReviewReportDeps } from "./review-report-route.js";
import type { Env } from "./v1.js";

/**
 * `POST /v1/bridgeAc/report`: the body is a bridgeAc input (optionally with `format` and `id`);
 * the answer is the AC bridge report (HTML by default, Markdown, or the result as JSON), rendered
 * from the result alone, with the period waveform asked for unless the body says `waveform: false`.
 */
export function mountBridgeAcReport(app: Hono<Env>, deps: ReviewReportDeps): void {
  mountProcedureReport(app, deps, "bridgeAc");
}
