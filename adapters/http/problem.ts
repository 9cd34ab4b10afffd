import type { Context as HonoContext } from "hono";
import type { ContentfulStatusCode } from "hono/utils/http-status";
import type { ErrorBody } from "../../contracts/outcome.js";
import type { Problem, ProblemCode } from "../../contracts/problem.js";

/** Titles of the known codes; a code added later reads as its own words ("unknown-rule-set" → "Unknown rule set"). */
const TITLES: Partial<Record<ProblemCode, string>> = {
  "invalid-input": "Invalid input",
  "unknown-part": "Unknown part",
  "unknown-procedure": "Unknown procedure",
  "fit-failed": "Datasheet points cannot be fitted",
  "malformed-line": "Malformed line",
  internal: "Internal error",
  "malformed-json": "Malformed JSON",
  "not-found": "Not found",
  "method-not-allowed": "Method not allowed",
  "payload-too-large": "Payload too large",
  "too-many-items": "Too many items",
  unauthorized: "Unauthorized",
  "compute-timeout": "Compute time exceeded",
  unavailable: "Service unavailable",
};

const titleOf = (code: string) => {
  const words = code.replaceAll("-", " ");
  return words.charAt(0).toUpperCase() + words.slice(1);
};

export const PROBLEM_TYPE = "application/problem+json";

/** What a client is told of an internal error (the error itself is only logged). */
export const INTERNAL_ERROR_MESSAGE = "internal error: the request was not completed (logged on the server)";

/** An RFC 9457 problem body; never carries a stack or an internal message. */
export function problemOf(
  status: number,
  body: ErrorBody | { code: ProblemCode; message: string; issues?: ErrorBody["issues"] },
  extra: { instance?: string | undefined; requestId?: string | undefined } = {},
): Problem {
  return {
    type: `urn:backstop:problem:${body.code}`,
    title: TITLES[body.code] ?? titleOf(body.code),
    status,
    detail: body.message,
    ...(extra.instance === undefined ? {} : { instance: extra.instance }),
    code: body.code,
    issues: body.issues ?? [],
    ...(extra.requestId === undefined ? {} : { requestId: extra.requestId }),
  };
}

/**
 * Send a problem as application/problem+json. Built with `c.body`, so the headers the request
 * middleware prepared (x-request-id) are in it from the start: a ready `Response` would have to be
 * copied to add them, through a web stream, several times the cost of the answer.
 */
export function sendProblem(
  c: HonoContext,
  status: number,
  body: Parameters<typeof problemOf>[1],
  headers: Record<string, string> = {},
): Response {
  const p = problemOf(status, body, { instance: c.req.path, requestId: c.get("requestId") as string | undefined });
  return c.body(JSON.stringify(p), status as ContentfulStatusCode, { "content-type": PROBLEM_TYPE, ...headers });
}

/** The error of a request past its compute budget (every route's: /v1, /trpc, reports; 503 with retry-after). */
export function computeTimeout(config: { readonly requestTimeoutMs: number }): ErrorBody {
  const message = `the request needed more than its ${config.requestTimeoutMs} ms compute budget; split it or raise BACKSTOP_REQUEST_TIMEOUT_MS`;
  return { code: "compute-timeout", message, issues: [] };
}
