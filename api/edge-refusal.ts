import { TRPCError } from "@trpc/server";
import type { Issue } from "../contracts/outcome.js";

/**
 * A request the HTTP edge refuses before any procedure runs: no valid API key, a body over the
 * limit. One record for both faces: /v1 answers it as problem+json (its `code`, `status`), /trpc
 * as a tRPC error (`trpcCode`, which tRPC maps to the same status), so @trpc/client reads it.
 */
export interface EdgeRefusal {
  readonly status: 401 | 413;
  readonly code: "unauthorized" | "payload-too-large";
  readonly trpcCode: "UNAUTHORIZED" | "PAYLOAD_TOO_LARGE";
  readonly message: string;
  /** response headers the refusal carries (WWW-Authenticate) */
  readonly headers?: Readonly<Record<string, string>>;
}

/** The cause of the tRPC error an edge refusal becomes, so the error formatter can give its own code. */
export class EdgeRefused extends Error {
  constructor(readonly refusal: EdgeRefusal) {
    super(refusal.message);
    this.name = "EdgeRefused";
  }
}

/** The tRPC error of a refusal (thrown where tRPC makes the call's context, so it answers in its own shape). */
export const edgeTrpcError = (r: EdgeRefusal): TRPCError =>
  new TRPCError({ code: r.trpcCode, message: r.message, cause: new EdgeRefused(r) });

/** The body of an edge refusal within a tRPC error (data.backstop), as /v1's problem gives its code. */
export function edgeBodyOf(err: unknown): { code: EdgeRefusal["code"]; message: string; issues: Issue[] } | undefined {
  const cause = err instanceof TRPCError ? err.cause : undefined;
  return cause instanceof EdgeRefused
    ? { code: cause.refusal.code, message: cause.refusal.message, issues: [] }
    : undefined;
}
