import { TRPCError } from "@trpc/server";
import type { Context } from "../../api/context.js";
import { InputProblem } from "../../api/input-problem.js";
import type { ErrorBody } from "../../contracts/outcome.js";
import type { ItemResult } from "../compute/call.js";
import type { ComputePool } from "../compute/pool.js";
import type { HttpConfig } from "./config.js";
import { depthProblem, inputShape } from "./input-shape.js";
import { computeTimeout } from "./problem.js";

const TRPC_CODE: Record<number, TRPCError["code"]> = {
  400: "BAD_REQUEST",
  404: "NOT_FOUND",
  422: "BAD_REQUEST",
  503: "SERVICE_UNAVAILABLE",
};

/** An error body as the TRPCError that answers it: errorBodyOf gives the same body back, httpStatusOf the same status. */
export function errorOfBody(status: number, body: ErrorBody): TRPCError {
  return new TRPCError({
    code: TRPC_CODE[status] ?? "INTERNAL_SERVER_ERROR",
    message: body.message,
    cause: new InputProblem(body.code, body.message, body.issues),
  });
}

/**
 * The HTTP server's `offload` for /trpc: every call runs in the compute threads under the request's
 * compute budget, as /v1's do (503 compute-timeout past it); no /trpc call runs in the main thread
 * (docs/performance.md, "Node 22"). An input nested deeper than the limit is refused before anything else reads it (422). Without a
 * pool: the depth check, then in process.
 */
export function trpcOffload(pool: ComputePool | undefined, config: HttpConfig): NonNullable<Context["offload"]> {
  return (path, raw) => {
    const shape = inputShape(raw);
    const deep = depthProblem(shape);
    if (deep !== undefined) return Promise.reject(errorOfBody(422, deep));
    if (pool === undefined) return undefined;
    const signal = AbortSignal.timeout(config.requestTimeoutMs);
    return pool.call(path, [raw], signal, true).then(
      (items) => {
        const it = items[0] as ItemResult;
        if (it.ok) return it.result;
        // an internal error keeps the thread's stack for the log (tRPC's onError), never for the client
        if (it.internal !== undefined)
          throw new TRPCError({ code: "INTERNAL_SERVER_ERROR", cause: new Error(it.internal) });
        throw errorOfBody(it.status, it.error);
      },
      (e: unknown) => {
        if (!signal.aborted) throw e;
        throw errorOfBody(503, computeTimeout(config));
      },
    );
  };
}
