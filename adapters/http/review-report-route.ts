import type { Hono } from "hono";
import type { Context } from "../../api/context.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import { reviewOutput } from "../../contracts/review.js";
import { callOne, type ItemResult } from "../compute/call.js";
import type { ComputePool } from "../compute/pool.js";
import type { Logger } from "../logging/logger.js";
import { type ReportOptions, renderReviewReport } from "../report/review-report.js";
import type { HttpConfig } from "./config.js";
import { sendProblem } from "./problem.js";
import type { Env } from "./v1.js";

type Format = "html" | "markdown" | "json";
const FORMATS: readonly Format[] = ["html", "markdown", "json"];

/** `?format=` or a `format` field of the body wins; else the Accept header; else HTML. */
function formatOf(query: string | undefined, field: unknown, accept: string | undefined): Format | { bad: string } {
  const asked = query ?? (typeof field === "string" ? field : undefined);
  if (asked !== undefined) return FORMATS.includes(asked as Format) ? (asked as Format) : { bad: asked };
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
  mountProcedureReport(app, deps, {
    procedure: "review",
    flag: "curves",
    render: (result, opts) => renderReviewReport(reviewOutput.parse(result), opts),
  });
}

/** What a report route needs: the procedure, the input flag that asks it for chart data, the renderer. */
export interface ReportRoute {
  readonly procedure: string;
  readonly flag: string;
  readonly render: (result: unknown, opts: ReportOptions) => { readonly html: string; readonly markdown: string };
}

type ReportHandler = (c: import("hono").Context<Env>) => Promise<Response>;

/**
 * The report handlers of each app, by procedure, behind one `POST /v1/:procedure/report` route:
 * a static path per procedure beside `/v1/:procedure/bulk` would make Hono fall back from its
 * regular-expression router to its slower trie router for every request.
 */
const reportHandlers = new WeakMap<Hono<Env>, Map<string, ReportHandler>>();

function reportRoute(app: Hono<Env>): Map<string, ReportHandler> {
  let handlers = reportHandlers.get(app);
  if (handlers === undefined) {
    const known = new Map<string, ReportHandler>();
    handlers = known;
    reportHandlers.set(app, known);
    app.post("/v1/:procedure/report", (c) => {
      const procedure = c.req.param("procedure") ?? "";
      const h = known.get(procedure);
      if (h !== undefined) return h(c);
      return sendProblem(c, 404, { code: "not-found", message: `no report for "${procedure}"; reports exist for ${[...known.keys()].join(", ")}`, issues: [{ path: ["procedure"], message: "no report for this procedure" }] });
    });
  }
  return handlers;
}

/** `POST /v1/<procedure>/report` for any procedure with a renderer (the review's route is the pattern). */
export function mountProcedureReport(app: Hono<Env>, deps: ReviewReportDeps, route: ReportRoute): void {
  const invoke = procedureInvoker(deps.ctx)(route.procedure);
  if (invoke === undefined) throw new Error(`the router has no ${route.procedure} procedure`);
  reportRoute(app).set(route.procedure, async (c) => {
    let body: unknown;
    try {
      body = JSON.parse(await c.req.text());
    } catch (e) {
      return sendProblem(c, 400, { code: "malformed-json", message: `the body is not JSON: ${(e as Error).message}` });
    }
    if (typeof body !== "object" || body === null || Array.isArray(body)) {
      return sendProblem(c, 400, { code: "invalid-input", message: `the body is a ${route.procedure} input (a JSON object)`, issues: [{ path: [], message: "expected an object" }] });
    }
    const { format: field, id: bodyId, ...fields } = body as Record<string, unknown>;
    // A report draws the chart data (review: curves; bridgeAc: waveform): ask for it unless the body says otherwise.
    const input = { [route.flag]: true, ...fields };
    const format = formatOf(c.req.query("format"), field, c.req.header("accept"));
    if (typeof format === "object") {
      return sendProblem(c, 400, { code: "invalid-input", message: `format must be one of ${FORMATS.join(", ")}`, issues: [{ path: ["format"], message: `unknown format "${format.bad}"` }] });
    }
    const id = c.req.query("id") ?? (typeof bodyId === "string" || typeof bodyId === "number" ? bodyId : undefined);
    let item: ItemResult | undefined;
    const signal = AbortSignal.timeout(deps.config.requestTimeoutMs);
    try {
      item = deps.pool ? (await deps.pool.call(route.procedure, [input], signal))[0] : await callOne(invoke, input);
    } catch (e) {
      if (!signal.aborted) throw e;
      return sendProblem(c, 503, { code: "compute-timeout", message: `the ${route.procedure} call needed more than its ${deps.config.requestTimeoutMs} ms compute budget` }, { "retry-after": "1" });
    }
    if (item === undefined) throw new Error(`the ${route.procedure} call returned no item`);
    if (!item.ok) {
      if (item.internal !== undefined) deps.logger.error({ requestId: c.get("requestId"), err: item.internal }, `${route.procedure} report failed`);
      return sendProblem(c, item.status, item.error);
    }
    if (format === "json") return c.body(JSON.stringify(item.result), 200, { "content-type": "application/json" });
    const report = route.render(item.result, id === undefined ? { svgDir: null } : { id, svgDir: null });
    return format === "html" ? c.html(report.html) : c.body(report.markdown, 200, { "content-type": "text/markdown; charset=utf-8" });
  });
}
