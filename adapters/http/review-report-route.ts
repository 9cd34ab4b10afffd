import type { Hono } from "hono";
import type { Context } from "../../api/context.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import { type ReportAnswer, reportAnswer } from "../compute/report-call.js";
import type { ComputePool } from "../compute/pool.js";
import type { Logger } from "../logging/logger.js";
import { REPORT_RENDERERS, type ReportFormat } from "../report/report-body.js";
import type { HttpConfig } from "./config.js";
import { depthProblem, inputShape } from "./input-shape.js";
import { computeTimeout, sendProblem } from "./problem.js";
import type { Env } from "./v1.js";

const FORMATS: readonly ReportFormat[] = ["html", "markdown", "json"];

/** `?format=` or a `format` field of the body wins; else the Accept header; else HTML. */
function formatOf(
  query: string | undefined,
  field: unknown,
  accept: string | undefined,
): ReportFormat | { bad: string } {
  const asked = query ?? (typeof field === "string" ? field : undefined);
  if (asked !== undefined) return FORMATS.includes(asked as ReportFormat) ? (asked as ReportFormat) : { bad: asked };
  const a = (accept ?? "").toLowerCase();
  if (a.includes("text/html")) return "html";
  if (a.includes("text/markdown")) return "markdown";
  if (a.includes("application/json")) return "json";
  return "html";
}

export interface ReviewReportDeps {
  readonly ctx: Context;
  readonly logger: Logger;
  readonly config: HttpConfig;
  readonly pool?: ComputePool | undefined;
}

/**
 * `POST /v1/review/report`: the body is a review input (as for `POST /v1/review`), optionally with
 * `format` and `id` fields; the answer is the design-review report as one self-contained HTML page
 * (default, or `Accept: text/html`), Markdown (`text/markdown`; the charts are only in the HTML),
 * or the review result as JSON. The review runs as under /v1 (worker pool and compute budget when
 * configured); errors are the same problem+json. The report is rendered from the result alone.
 */
export function mountReviewReport(app: Hono<Env>, deps: ReviewReportDeps): void {
  mountProcedureReport(app, deps, "review");
}

/**
 * `POST /v1/<procedure>/report` for any procedure with a renderer (REPORT_RENDERERS). The call and
 * the drawing run together in a compute thread under the request's compute budget (in process
 * without a pool); a result that cannot be drawn is a 422 `report-failed`, never a 5xx.
 */
export function mountProcedureReport(app: Hono<Env>, deps: ReviewReportDeps, procedure: string): void {
  const renderer = REPORT_RENDERERS[procedure];
  const invoke = procedureInvoker(deps.ctx)(procedure);
  if (invoke === undefined || renderer === undefined)
    throw new Error(`the router has no ${procedure} procedure with a report`);
  app.post(`/v1/${procedure}/report`, async (c) => {
    let body: unknown;
    try {
      body = JSON.parse(await c.req.text());
    } catch (e) {
      return sendProblem(c, 400, { code: "malformed-json", message: `the body is not JSON: ${(e as Error).message}` });
    }
    if (typeof body !== "object" || body === null || Array.isArray(body)) {
      return sendProblem(c, 400, {
        code: "invalid-input",
        message: `the body is a ${procedure} input (a JSON object)`,
        issues: [{ path: [], message: "expected an object" }],
      });
    }
    const deep = depthProblem(inputShape(body));
    if (deep !== undefined) return sendProblem(c, 422, deep);
    const { format: field, id: bodyId, ...fields } = body as Record<string, unknown>;
    // A report draws the chart data (review: curves; bridgeAc: waveform): ask for it unless the body says otherwise.
    const input = { [renderer.flag]: true, ...fields };
    const format = formatOf(c.req.query("format"), field, c.req.header("accept"));
    if (typeof format === "object") {
      return sendProblem(c, 400, {
        code: "invalid-input",
        message: `format must be one of ${FORMATS.join(", ")}`,
        issues: [{ path: ["format"], message: `unknown format "${format.bad}"` }],
      });
    }
    const id = c.req.query("id") ?? (typeof bodyId === "string" || typeof bodyId === "number" ? bodyId : undefined);
    const task = { procedure, input, format, id };
    let answer: ReportAnswer;
    const signal = AbortSignal.timeout(deps.config.requestTimeoutMs);
    try {
      answer = deps.pool ? await deps.pool.report(task, signal) : await reportAnswer(invoke, task);
    } catch (e) {
      if (!signal.aborted) throw e;
      return sendProblem(c, 503, computeTimeout(deps.config), { "retry-after": "1" });
    }
    if (!answer.ok) {
      if (answer.internal !== undefined)
        deps.logger.error({ requestId: c.get("requestId"), err: answer.internal }, `${procedure} report failed`);
      return sendProblem(c, answer.status, answer.error);
    }
    if (format === "json") return c.body(answer.text, 200, { "content-type": "application/json" });
    return format === "html"
      ? c.html(answer.text)
      : c.body(answer.text, 200, { "content-type": "text/markdown; charset=utf-8" });
  });
}
