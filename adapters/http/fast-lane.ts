import type { IncomingMessage, ServerResponse } from "node:http";
import { getRequestListener } from "@hono/node-server";
import type { Hono } from "hono";
import type { Context } from "../../api/context.js";
import { procedureEntries, procedureInvoker, type Invoke } from "../../api/procedure-registry.js";
import { callOneJson } from "../compute/call.js";
import type { Logger } from "../logging/logger.js";
import { apiKeyChecker, presentedKey } from "./auth.js";
import type { HttpConfig } from "./config.js";
import type { Adapter, Metrics } from "./metrics.js";
import { INTERNAL_ERROR_MESSAGE, PROBLEM_TYPE, problemOf } from "./problem.js";
import { logRequest, requestIdOf } from "./request-line.js";
import { type Env, INLINE_MAX_BODY_CHARS, INLINE_PROCEDURES } from "./v1.js";

export interface RequestListenerDeps {
  readonly app: Hono<Env>;
  readonly ctx: Context;
  readonly logger: Logger;
  readonly config: HttpConfig;
  readonly metrics: Metrics;
  /** false while draining (answers then carry `connection: close`, as the app's own do) */
  readonly isReady?: () => boolean;
  /** false: every request goes through the Hono app (BACKSTOP_FAST_LANE=0) */
  readonly fastLane?: boolean;
}

/** Largest body a tRPC call may have to take the lane (larger ones go through the app): as /v1's inline bound. */
const TRPC_LANE_MAX_BODY_BYTES = INLINE_MAX_BODY_CHARS;

interface Lane {
  readonly adapter: Adapter;
  readonly procedure: string;
  /** the URL path the lane answers (`/v1/operatingPoint`) */
  readonly path: string;
  readonly invoke: Invoke;
  readonly maxBodyBytes: number;
}

type NodeListener = (req: IncomingMessage, res: ServerResponse) => void;

/**
 * The server's node:http request listener: the Hono app for everything, except a lane for the
 * two hottest shapes of request, answered on node's own request and response objects.
 *
 * - `POST /v1/<procedure>` of a procedure /v1 runs in the main thread (operatingPoint, rules.list,
 *   rules.show) with a declared body of at most 16 KiB;
 * - a single (unbatched) tRPC call of one of those procedures: `POST /trpc/<procedure>` with a JSON
 *   body of at most 16 KiB, or `GET /trpc/<procedure>?input=<JSON>`.
 *
 * Through the app, the same call costs the web Request and Response objects, the middleware chain
 * and (for tRPC) its fetch adapter's abort signals and option copies: several times the call itself.
 * The lane answers only what it can answer exactly as the app would: a successful call gets the
 * same body, status, request id, `connection: close` while draining, metrics and log line.
 * Everything else (a request the lane does not take, a body that is not JSON, an invalid input, any
 * procedure error, a failed API key) goes to the app: before the body is read, as the request
 * itself; after, as a copy with the body read. The app's own tests and
 * test/adapters/fast-lane.test.ts (lane against app, byte for byte) hold the two to one behaviour.
 */
export function createRequestListener(deps: RequestListenerDeps): NodeListener {
  const { app, ctx, logger, config, metrics, isReady = () => true } = deps;
  const hono = getRequestListener(app.fetch) as NodeListener;
  if (deps.fastLane === false) return hono;
  const lanes = laneTable(ctx, config);
  const checkKey = config.apiKeys ? apiKeyChecker(config.apiKeys) : undefined;

  function answer(req: IncomingMessage, res: ServerResponse, lane: Lane, body: string, requestId: string, startedMs: number): void {
    const headers: Record<string, string> =
      lane.adapter === "trpc"
        ? { "content-type": "application/json", vary: "trpc-accept, accept", "x-request-id": requestId, "content-length": String(Buffer.byteLength(body)) }
        : { "content-type": "application/json", "x-request-id": requestId, "content-length": String(Buffer.byteLength(body)) };
    if (!isReady()) headers.connection = "close";
    res.writeHead(200, headers);
    res.end(body);
    metrics.countRequest(lane.adapter, 200);
    logRequest(logger, requestId, req.method ?? "", lane.path, 200, startedMs);
  }

  async function call(req: IncomingMessage, res: ServerResponse, lane: Lane, text: string, raw: Buffer | undefined, startedMs: number): Promise<void> {
    let input: unknown;
    try {
      input = JSON.parse(text);
    } catch {
      return replay(app, req, res, raw, logger);
    }
    const it = await callOneJson(lane.invoke, input);
    if (!it.ok) return replay(app, req, res, raw, logger);
    metrics.observeProcedure(lane.adapter, lane.procedure, it.outcome, it.seconds);
    const requestId = requestIdOf(header(req, "x-request-id"));
    if (lane.adapter === "v1") answer(req, res, lane, it.json ?? "", requestId, startedMs);
    else answer(req, res, lane, it.json === undefined ? '{"result":{}}' : `{"result":{"data":${it.json}}}`, requestId, startedMs);
  }

  return (req, res) => {
    const startedMs = performance.now();
    const url = req.url ?? "";
    const q = url.indexOf("?");
    const lane = lanes.get(q < 0 ? url : url.slice(0, q));
    if (lane === undefined || (checkKey !== undefined && !checkKey(presentedKey(header(req, "authorization"), header(req, "x-api-key"))))) return hono(req, res);
    if (req.method === "GET" && lane.adapter === "trpc") {
      const text = getInput(url, q);
      if (text === undefined || req.headers["content-length"] !== undefined || req.headers["transfer-encoding"] !== undefined || req.headers["trpc-accept"] !== undefined) return hono(req, res);
      call(req, res, lane, text, undefined, startedMs).catch((e: unknown) => failed(res, e, logger));
      return;
    }
    const length = declaredLength(req);
    if (req.method !== "POST" || q >= 0 || length === undefined || length > lane.maxBodyBytes) return hono(req, res);
    if (lane.adapter === "trpc" && (req.headers["trpc-accept"] !== undefined || !(req.headers["content-type"] ?? "").startsWith("application/json"))) return hono(req, res);
    readBody(req, length, (raw) => {
      call(req, res, lane, raw.toString("utf8"), raw, startedMs).catch((e: unknown) => failed(res, e, logger));
    });
  };
}

/** `/v1/<p>` and `/trpc/<p>` of the procedures the lane takes. */
function laneTable(ctx: Context, config: HttpConfig): Map<string, Lane> {
  const invoker = procedureInvoker(ctx);
  const lanes = new Map<string, Lane>();
  for (const e of procedureEntries()) {
    const invoke = invoker(e.path);
    if (invoke === undefined) continue;
    if (INLINE_PROCEDURES.has(e.path)) lanes.set(`/v1/${e.path}`, { adapter: "v1", procedure: e.path, path: `/v1/${e.path}`, invoke, maxBodyBytes: Math.min(INLINE_MAX_BODY_CHARS, config.maxBodyBytes) });
    // only the procedures that run in the main thread: every other call is the compute threads' (trpc-offload.ts)
    if (e.type === "query" && INLINE_PROCEDURES.has(e.path)) lanes.set(`/trpc/${e.path}`, { adapter: "trpc", procedure: e.path, path: `/trpc/${e.path}`, invoke, maxBodyBytes: Math.min(TRPC_LANE_MAX_BODY_BYTES, config.maxBodyBytes) });
  }
  return lanes;
}

function header(req: IncomingMessage, name: string): string | undefined {
  const v = req.headers[name];
  return Array.isArray(v) ? v.join(", ") : v;
}

/** The declared body length of a request with no transfer coding, else undefined. */
function declaredLength(req: IncomingMessage): number | undefined {
  const cl = req.headers["content-length"];
  if (cl === undefined || req.headers["transfer-encoding"] !== undefined || !/^\d{1,9}$/.test(cl)) return undefined;
  return Number(cl);
}

/** The `input` of a query string that holds nothing else, decoded; else undefined. */
function getInput(url: string, q: number): string | undefined {
  if (q < 0) return undefined;
  const params = new URLSearchParams(url.slice(q + 1));
  let n = 0;
  for (const _ of params.keys()) n += 1;
  return n === 1 ? (params.get("input") ?? undefined) : undefined;
}

/** Collect a body of the declared length; a request that ends early or fails is dropped (node answers or closes it). */
function readBody(req: IncomingMessage, length: number, done: (raw: Buffer) => void): void {
  const chunks: Buffer[] = [];
  req.on("data", (c: Buffer) => chunks.push(c));
  req.once("error", () => undefined);
  req.once("end", () => {
    const raw = chunks.length === 1 ? (chunks[0] as Buffer) : Buffer.concat(chunks);
    if (raw.length === length) done(raw);
  });
}

/** The request, its body already read, answered by the app (the same answer it would have given first hand). */
async function replay(app: Hono<Env>, req: IncomingMessage, res: ServerResponse, raw: Buffer | undefined, logger: Logger): Promise<void> {
  const headers = new Headers();
  for (let i = 0; i + 1 < req.rawHeaders.length; i += 2) headers.append(req.rawHeaders[i] as string, req.rawHeaders[i + 1] as string);
  const url = `http://${req.headers.host ?? "localhost"}${req.url ?? "/"}`;
  const init: RequestInit = raw === undefined ? { method: req.method ?? "GET", headers } : { method: req.method ?? "POST", headers, body: new Uint8Array(raw.buffer, raw.byteOffset, raw.length) };
  try {
    const response = await app.fetch(new Request(url, init));
    const body = Buffer.from(await response.arrayBuffer());
    const out: Record<string, string> = {};
    response.headers.forEach((v, k) => {
      out[k] = v;
    });
    out["content-length"] = String(body.length);
    res.writeHead(response.status, out);
    res.end(body);
  } catch (e) {
    failed(res, e, logger);
  }
}

/** A fault in the lane itself (a bug): logged, and a plain 500 if nothing was sent yet. */
function failed(res: ServerResponse, e: unknown, logger: Logger): void {
  logger.error({ err: e }, "request lane failed");
  if (res.headersSent) {
    res.destroy();
    return;
  }
  const body = JSON.stringify(problemOf(500, { code: "internal", message: INTERNAL_ERROR_MESSAGE }));
  res.writeHead(500, { "content-type": PROBLEM_TYPE, "content-length": String(Buffer.byteLength(body)) });
  res.end(body);
}
