import { fetchRequestHandler } from "@trpc/server/adapters/fetch";
import { type Context as HonoContext, Hono, type MiddlewareHandler } from "hono";
import { bodyLimit } from "hono/body-limit";
import type { Context } from "../../api/context.js";
import { type EdgeRefusal, edgeTrpcError } from "../../api/edge-refusal.js";
import { errorBodyOf } from "../../api/error-body.js";
import { httpStatusOf } from "../../api/procedure-registry.js";
import { appRouter } from "../../api/router.js";
import { outcomeLabel } from "../compute/call.js";
import type { ReloadReport } from "../catalog/live-catalog.js";
import type { ComputePool } from "../compute/pool.js";
import type { Logger } from "../logging/logger.js";
import { apiKeyChecker, presentedKey } from "./auth.js";
import { DEFAULT_HTTP_CONFIG, type HttpConfig } from "./config.js";
import { createMetrics, type Metrics, routeLabel } from "./metrics.js";
import { servedOpenApiText } from "../openapi/document.js";
import { INTERNAL_ERROR_MESSAGE, sendProblem } from "./problem.js";
import { logRequest, requestIdOf } from "./request-line.js";
import { mountBridgeAcReport } from "./bridge-report-route.js";
import { mountReviewReport } from "./review-report-route.js";
import { trpcOffload } from "./trpc-offload.js";
import { type Env, mountV1 } from "./v1.js";

export interface AppDeps {
  readonly ctx: Context;
  readonly logger: Logger;
  readonly config?: HttpConfig;
  readonly metrics?: Metrics;
  /** worker threads for /v1 (a hard stop at the compute budget); absent: in process */
  readonly pool?: ComputePool | undefined;
  /** false while draining: /readyz answers 503 */
  readonly isReady?: () => boolean;
  /** the last parts catalog reload (the server's live catalog), shown in /readyz */
  readonly catalogReload?: () => ReloadReport | undefined;
}

const PROTECTED = /^\/(trpc|v1)(\/|$)/;
const TRPC_PATH = /^\/trpc(\/|$)/;

const UNAUTHORIZED: EdgeRefusal = {
  status: 401,
  code: "unauthorized",
  trpcCode: "UNAUTHORIZED",
  message: "a valid API key is required (Authorization: Bearer <key> or X-API-Key)",
  headers: { "www-authenticate": 'Bearer realm="backstop"' },
};

/** The HTTP face of backstop: tRPC under /trpc, plain JSON under /v1, OpenAPI, probes, metrics, one log line per request. */
export function createApp({
  ctx,
  logger,
  config = DEFAULT_HTTP_CONFIG,
  metrics = createMetrics(),
  pool,
  isReady = () => true,
  catalogReload,
}: AppDeps): Hono<Env> {
  const app = new Hono<Env>();
  const checkKey = config.apiKeys ? apiKeyChecker(config.apiKeys) : undefined;

  app.use("*", async (c, next) => {
    const requestId = requestIdOf(c.req.header("x-request-id"));
    c.set("requestId", requestId);
    const started = performance.now();
    const closing = !isReady();
    c.set("closing", closing);
    // set before the handler builds its response (c.body, c.json take them); a handler that returns a
    // ready Response (tRPC's) gets them after
    c.header("x-request-id", requestId);
    if (closing) c.header("connection", "close");
    await next();
    if (c.res.headers.get("x-request-id") !== requestId) {
      c.header("x-request-id", requestId);
      if (closing) c.header("connection", "close");
    }
    const path = c.req.path;
    metrics.countRequest(routeLabel(path), c.res.status);
    logRequest(logger, requestId, c.req.method, path, c.res.status, started);
  });

  const offload = trpcOffload(pool, config);
  // tRPC under /trpc; a request the edge refused (c.get("refusal")) fails where tRPC makes its
  // context, so tRPC answers every call of it in its own shape (single, batch or stream) unread
  const serveTrpc = (c: HonoContext<Env>) =>
    fetchRequestHandler({
      endpoint: "/trpc",
      req: c.req.raw,
      router: appRouter,
      allowMethodOverride: true,
      maxBatchSize: config.maxTrpcBatch,
      createContext: () => {
        const refusal = c.get("refusal");
        if (refusal !== undefined) throw edgeTrpcError(refusal);
        return {
          ...ctx,
          offload,
          observe: (o) =>
            metrics.observeProcedure(
              "trpc",
              o.path,
              o.ok ? outcomeLabel(o.data) : errorBodyOf(o.error).code,
              o.seconds,
            ),
        };
      },
      // the request id in tRPC's own response (adding it afterwards would copy the response through a web stream)
      // and 422 for a single call refused over a limit (tRPC's own mapping has no such status)
      responseMeta: ({ errors, info }) => {
        const headers: Record<string, string> =
          c.get("closing") === true
            ? { "x-request-id": c.get("requestId"), connection: "close" }
            : { "x-request-id": c.get("requestId") };
        Object.assign(headers, c.get("refusal")?.headers);
        const limited = info?.isBatchCall !== true && errors.length === 1 && httpStatusOf(errors[0]) === 422;
        return limited ? { headers, status: 422 } : { headers };
      },
      onError: ({ error, path }) => {
        // tRPC's own words do not say the limit; onError runs before the error is formatted
        if (error.message === "Batch call exceeds maximum size")
          error.message = `a tRPC batch holds at most ${config.maxTrpcBatch} calls (BACKSTOP_MAX_TRPC_BATCH): split it, or send many cases of one procedure to /v1/<procedure>/bulk`;
        if (error.code === "INTERNAL_SERVER_ERROR")
          logger.error({ requestId: c.get("requestId"), path, err: error.cause ?? error }, "procedure failed");
      },
    });
  /** An edge refusal: problem+json, except under /trpc, where tRPC answers it as its error. */
  const refuse = (c: HonoContext<Env>, r: EdgeRefusal) => {
    if (TRPC_PATH.test(c.req.path)) {
      c.set("refusal", r);
      return serveTrpc(c);
    }
    return sendProblem(c, r.status, { code: r.code, message: r.message }, r.headers);
  };

  // API keys guard the analyses only; probes, metrics and the OpenAPI document stay open.
  // (registered only when keys are configured: one middleware less on every request otherwise)
  if (checkKey !== undefined) {
    app.use("*", async (c, next) => {
      if (!PROTECTED.test(c.req.path)) return next();
      if (checkKey(presentedKey(c.req.header("authorization"), c.req.header("x-api-key")))) return next();
      return refuse(c, UNAUTHORIZED);
    });
  }

  const tooLarge = (c: HonoContext<Env>) =>
    refuse(c, {
      status: 413,
      code: "payload-too-large",
      trpcCode: "PAYLOAD_TOO_LARGE",
      message: `the request body exceeds ${config.maxBodyBytes} bytes (BACKSTOP_MAX_BODY_BYTES)`,
    });
  const streamedLimit = bodyLimit({ maxSize: config.maxBodyBytes, onError: tooLarge });
  // A declared length is checked from the header alone (hono's bodyLimit would first turn the body
  // into a web stream, a third of a small request's cost); a streamed body is counted as it comes.
  const limit: MiddlewareHandler<Env> = async (c, next) => {
    const length = c.req.header("content-length");
    if (length !== undefined && c.req.header("transfer-encoding") === undefined)
      return Number(length) > config.maxBodyBytes ? tooLarge(c) : next();
    return streamedLimit(c, next);
  };
  app.use("/trpc/*", limit);
  app.use("/v1/*", limit);

  app.get("/livez", (c) => c.json({ status: "ok" }));
  app.get("/healthz", (c) => c.json({ status: "ok" }));
  // the detail: the catalog in use and its last reload (a refused one keeps the old catalog and stays ready)
  app.get("/readyz", (c) => {
    const last = catalogReload?.();
    const catalog = { ...ctx.catalog.stamp, ...(last === undefined ? {} : { lastReload: last }) };
    return isReady() ? c.json({ status: "ready", catalog }) : c.json({ status: "draining", catalog }, 503);
  });
  app.get("/metrics", async (c) => {
    let text: string;
    try {
      text = await metrics.registry.metrics();
    } catch (e) {
      logger.error({ requestId: c.get("requestId"), err: e }, "metrics unavailable");
      return sendProblem(
        c,
        503,
        { code: "unavailable", message: "the metrics could not be gathered; try again" },
        { "retry-after": "1" },
      );
    }
    return c.body(text, 200, { "content-type": metrics.registry.contentType });
  });
  // the public key that checks verdict-record signatures (README, "Verdict records")
  app.get("/v1/record-key", (c) => {
    const signer = ctx.recordSigner;
    if (signer === undefined)
      return sendProblem(c, 404, {
        code: "not-found",
        message: "this service signs no verdict records: no BACKSTOP_RECORD_KEY_FILE or BACKSTOP_RECORD_KEY is set",
      });
    return c.json({ alg: "Ed25519", keyId: signer.keyId, publicKeyPem: signer.publicKeyPem });
  });
  let openapi: string | undefined;
  app.get("/openapi.json", (c) => {
    openapi ??= servedOpenApiText();
    return c.body(openapi, 200, { "content-type": "application/json" });
  });

  app.all("/trpc/*", serveTrpc);

  mountReviewReport(app, { ctx, logger, config, pool });
  mountBridgeAcReport(app, { ctx, logger, config, pool });
  mountV1(app, { ctx, logger, config, metrics, pool });

  app.notFound((c) => sendProblem(c, 404, { code: "not-found", message: `no route ${c.req.method} ${c.req.path}` }));
  app.onError((err, c) => {
    logger.error({ requestId: c.get("requestId"), err }, "unhandled error");
    return sendProblem(c, 500, { code: "internal", message: INTERNAL_ERROR_MESSAGE });
  });
  return app;
}
