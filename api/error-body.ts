import { TRPCError } from "@trpc/server";
import { ZodError } from "zod";
import { isLimitMessage, LIMITS } from "../contracts/limits.js";
import type { ErrorBody, Issue } from "../contracts/outcome.js";
import { countIssues, issuesOf, pathText } from "../contracts/zod-messages.js";
import { InputProblem } from "./input-problem.js";

/**
 * The one error body of backstop, used by the tRPC error formatter and by the batch writer, so a
 * bad input reads the same over every adapter. Internal errors never carry a stack or a message
 * from inside.
 */
/** Error codes of an input that is well formed but that the service will not answer as asked (HTTP 422). */
export const UNPROCESSABLE_CODES: ReadonlySet<string> = new Set([
  "limit-exceeded",
  "answer-too-large",
  "report-failed",
]);

export function errorBodyOf(err: unknown): ErrorBody {
  const cause = err instanceof TRPCError ? err.cause : err;
  if (cause instanceof ZodError) {
    // an input past a limit is refused for that alone (HTTP 422): its other issues may be many and are beside the point
    const over = cause.issues.filter((i) => isLimitMessage(i.message));
    const chosen = over.length > 0 ? over : cause.issues;
    const listed = issuesOf(chosen);
    const issues = cappedIssues(countIssues(chosen), (k) => listed[k] as Issue);
    const first = issues[0];
    const where = first ? `${pathText(first.path)}: ${first.message}` : "invalid input";
    return over.length > 0
      ? { code: "limit-exceeded", message: `input over a limit at ${where}`, issues }
      : { code: "invalid-input", message: `invalid input at ${where}`, issues };
  }
  // (a problem relayed from a compute thread was capped there: its closing count is kept as it is)
  if (cause instanceof InputProblem) {
    const issues =
      cause.issues.length <= LIMITS.maxErrorIssues + 1
        ? cause.issues
        : cappedIssues(cause.issues.length, (k) => cause.issues[k] as Issue);
    return { code: cause.code, message: cause.message, issues };
  }
  if (err instanceof TRPCError && err.code === "NOT_FOUND")
    return { code: "unknown-procedure", message: err.message, issues: [{ path: ["procedure"], message: err.message }] };
  // a body tRPC could not read (not JSON, a bad batch): the fault is the input as a whole
  if (err instanceof TRPCError && err.code !== "INTERNAL_SERVER_ERROR")
    return { code: "invalid-input", message: err.message, issues: [{ path: [], message: err.message }] };
  return {
    code: "internal",
    message: "internal error: the request was not completed (logged on the server)",
    issues: [],
  };
}

/**
 * The first LIMITS.maxErrorIssues issues of `count` (built only as far as needed), and where there are
 * more, one closing issue that counts the rest: an error answer is never larger than a bounded
 * multiple of the limit, however many problems the input has.
 */
export function cappedIssues(count: number, issueAt: (k: number) => Issue): Issue[] {
  const shown = Math.min(count, LIMITS.maxErrorIssues);
  const out: Issue[] = [];
  for (let k = 0; k < shown; k += 1) out.push(issueAt(k));
  if (count > shown)
    out.push({
      path: [],
      message: `${count - shown} more issues not listed (the first ${shown} of ${count} are; limit BACKSTOP_MAX_ERROR_ISSUES)`,
    });
  return out;
}
