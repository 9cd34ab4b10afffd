import { randomUUID } from "node:crypto";
import type { Logger } from "../logging/logger.js";

const REQUEST_ID = /^[\w.:-]{1,128}$/;

/** The request's id: the client's `x-request-id` when it is a plain token of at most 128 characters, else a new UUID. */
export function requestIdOf(incoming: string | undefined): string {
  return incoming !== undefined && REQUEST_ID.test(incoming) ? incoming : randomUUID();
}

/** The one log line of every request (the same fields whichever path answered it). */
export function logRequest(
  logger: Logger,
  requestId: string,
  method: string,
  path: string,
  status: number,
  startedMs: number,
): void {
  logger.info(
    { requestId, method, path, status, durationMs: Math.round((performance.now() - startedMs) * 1000) / 1000 },
    "request",
  );
}
