import type { EdgeRefusal } from "../../api/edge-refusal.js";
import type { Hono } from "hono";
import { procedureEntries, procedureEntry, procedureInvoker } from "../../api/procedure-registry.js";
import type { Context } from "../../api/context.js";
import { LIMITS } from "../../contracts/limits.js";
import { answerLimitHit, callOneJson, type ItemJson } from "../compute/call.js";
import type { ComputePool } from "../compute/pool.js";
import type { Logger } from "../logging/logger.js";
import type { HttpConfig } from "./config.js";
import type { Adapter, Metrics } from "./metrics.js";
import { depthProblem, inputShape } from "./input-shape.js";
import { computeTimeout, problemOf, sendProblem } from "./problem.js";
import { utf8Join } from "../utf8-join.js";

export type Env = {
  Variables: {
    requestId: string;
    closing: boolean;
    /** set where the edge refused a /trpc request: tRPC answers it (adapters/http/app.ts) */
    refusal?: EdgeRefusal;
  };
};

/** A JSON answer: the request middleware has set its request id (and `connection: close` while draining). */
function jsonAnswer(c: import("hono").Context<Env>, text: string | Uint8Array, status: 200): Response {
  return c.body(text as string, status, { "content-type": "application/json" });
}

export interface V1Deps {
  readonly ctx: Context;
  readonly logger: Logger;
  readonly config: HttpConfig;
  readonly metrics: Metrics;
  readonly pool?: ComputePool | undefined;
}

class ComputeTimeout extends Error {}

/**
 * Procedures whose single call is cheap and bounded (tens of microseconds for a plain operating
 * point): a single /v1 request of one of them with a body of at most INLINE_MAX_BODY_CHARS runs here,
 * in the main thread, because handing it to a worker thread and back costs more than the call. Bench
 * row `ab-node22` "no-inline: /v1/operatingPoint" (Node 22, 5 alternating runs): without it 0.80
 * (0.62-1.09) of the rate with it. A larger body (an inline rule set, a long table), any other
 * procedure, every bulk request and every /trpc call keep the worker threads and their hard compute
 * budget.
 */
export const INLINE_PROCEDURES: ReadonlySet<string> = new Set(["operatingPoint", "rules.list", "rules.show"]);
export const INLINE_MAX_BODY_CHARS = 16 * 1024;

const yieldToLoop = () => new Promise<void>((r) => setImmediate(r));

/**
 * `POST /v1/<procedure>` (one input → its result) and `POST /v1/<procedure>/bulk` (an array of inputs
 * → `{ results: [{ ok, result } | { ok: false, problem }], ok, failed }`, in order), for every
 * procedure of the router. Same router, same validation, same JSON as /trpc; errors are RFC 9457.
 */
export function mountV1(app: Hono<Env>, deps: V1Deps): void {
  const { ctx, logger, config, metrics, pool } = deps;
  const invoker = procedureInvoker(ctx);

  /**
   * Run the inputs in order within the request's compute budget: in the pool (hard stop) or here
   * (checked between items); each result comes back written out as JSON.
   */
  async function execute(
    path: string,
    inputs: unknown[],
    adapter: Adapter,
    requestId: string,
    inline: boolean,
  ): Promise<ItemJson[]> {
    let items: ItemJson[];
    if (pool && !inline) {
      const signal = AbortSignal.timeout(config.requestTimeoutMs);
      const size = Math.max(1, Math.min(256, Math.ceil(inputs.length / pool.threads)));
      const slices: unknown[][] = [];
      for (let i = 0; i < inputs.length; i += size) slices.push(inputs.slice(i, i + size));
      try {
        items = (await Promise.all(slices.map((s) => pool.callJson(path, s, signal)))).flat();
      } catch (e) {
        if (signal.aborted) throw new ComputeTimeout();
        throw e;
      }
    } else {
      const invoke = invoker(path);
      if (invoke === undefined) throw new Error(`no procedure ${path}`);
      items = [];
      let lastYield = performance.now();
      const deadline = lastYield + config.requestTimeoutMs;
      for (const input of inputs) {
        if (performance.now() > deadline) throw new ComputeTimeout();
        items.push(await callOneJson(invoke, input));
        if (performance.now() - lastYield > 10) {
          await yieldToLoop(); // keep probes and other requests answered during a long bulk call
          lastYield = performance.now();
        }
      }
    }
    for (const it of items) {
      metrics.observeProcedure(adapter, path, it.outcome, it.seconds);
      if (!it.ok && it.internal !== undefined) logger.error({ requestId, path, err: it.internal }, "procedure failed");
    }
    return items;
  }

  async function readJson(
    req: Request,
  ): Promise<{ ok: true; value: unknown; chars: number } | { ok: false; message: string }> {
    const text = await req.text();
    try {
      return { ok: true, value: JSON.parse(text), chars: text.length };
    } catch (e) {
      return { ok: false, message: `the body is not JSON: ${(e as Error).message}` };
    }
  }

  app.get("/v1", (c) =>
    c.json({
      procedures: procedureEntries().map((e) => ({
        path: e.path,
        type: e.type,
        description: e.description ?? null,
        url: `/v1/${e.path}`,
        bulkUrl: `/v1/${e.path}/bulk`,
      })),
    }),
  );

  const handler = (bulk: boolean) => async (c: import("hono").Context<Env>) => {
    const path = c.req.param("procedure") ?? "";
    if (procedureEntry(path) === undefined) {
      return sendProblem(c, 404, {
        code: "unknown-procedure",
        message: `no procedure "${path}"`,
        issues: [{ path: ["procedure"], message: "unknown procedure" }],
      });
    }
    const body = await readJson(c.req.raw);
    if (!body.ok)
      return sendProblem(c, 400, {
        code: "malformed-json",
        message: body.message,
        issues: [{ path: [], message: body.message }],
      });
    // checked before the input goes anywhere (a compute thread's structured clone recurses)
    const extra = bulk ? 1 : 0; // a bulk body's items are one level down
    const deep = depthProblem(inputShape(body.value, LIMITS.maxInputDepth + extra), extra);
    if (deep !== undefined) return sendProblem(c, 422, deep);
    let inputs: unknown[];
    if (bulk) {
      if (!Array.isArray(body.value))
        return sendProblem(c, 400, {
          code: "invalid-input",
          message: "a bulk body is a JSON array of inputs",
          issues: [{ path: [], message: "expected an array" }],
        });
      if (body.value.length > config.maxBulkItems) {
        return sendProblem(c, 413, {
          code: "too-many-items",
          message: `a bulk request holds at most ${config.maxBulkItems} items, this one ${body.value.length}`,
        });
      }
      inputs = body.value;
    } else inputs = [body.value];
    let items: ItemJson[];
    const inline = !bulk && INLINE_PROCEDURES.has(path) && body.chars <= INLINE_MAX_BODY_CHARS;
    try {
      items = await execute(path, inputs, bulk ? "v1-bulk" : "v1", c.get("requestId"), inline);
    } catch (e) {
      if (e instanceof ComputeTimeout) return sendProblem(c, 503, computeTimeout(config), { "retry-after": "1" });
      throw e;
    }
    const tooLarge = answerLimitHit(items);
    if (tooLarge !== undefined) return sendProblem(c, tooLarge.status, tooLarge.error);
    if (!bulk) {
      const it = items[0] as ItemJson;
      if (it.ok) return jsonAnswer(c, it.json as string, 200);
      return sendProblem(c, it.status, it.error);
    }
    return jsonAnswer(c, bulkBodyUtf8(items), 200);
  };

  app.post("/v1/:procedure/bulk", handler(true));
  app.post("/v1/:procedure", handler(false));
  app.on(["GET", "PUT", "PATCH", "DELETE"], ["/v1/:procedure", "/v1/:procedure/bulk"], (c) =>
    sendProblem(
      c,
      405,
      { code: "method-not-allowed", message: `${c.req.method} is not allowed here; POST the input as JSON` },
      { allow: "POST" },
    ),
  );
}

/**
 * The bulk answer, `JSON.stringify({ results: [{ ok: true, result } | { ok: false, problem }], ok, failed })`
 * byte for byte, joined from the results already written out (each result is serialised once).
 */
export function bulkBody(items: readonly ItemJson[]): string {
  return bulkParts(items).join("");
}

/** {@link bulkBody} as UTF-8 bytes (see utf8Join): what the bulk route sends. */
export function bulkBodyUtf8(items: readonly ItemJson[]): Buffer {
  return utf8Join(bulkParts(items));
}

/** The pieces of the bulk answer, separators included, in order (no piece is a joined copy of results). */
function bulkParts(items: readonly ItemJson[]): string[] {
  let ok = 0;
  const parts: string[] = ['{"results":['];
  for (let i = 0; i < items.length; i += 1) {
    const it = items[i] as ItemJson;
    if (i > 0) parts.push(",");
    if (it.ok) {
      ok += 1;
      if (it.json === undefined) parts.push('{"ok":true}');
      else parts.push('{"ok":true,"result":', it.json, "}");
    } else parts.push(JSON.stringify({ ok: false, problem: problemOf(it.status, it.error) }));
  }
  parts.push(`],"ok":${ok},"failed":${items.length - ok}}`);
  return parts;
}
