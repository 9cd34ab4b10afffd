import { TRPCError } from "@trpc/server";
import { ZodError } from "zod";
import type { ErrorBody } from "../contracts/outcome.js";
import { issuesOf, pathText } from "../contracts/zod-messages.js";
import { InputProblem } from "./input-problem.js";

/**
 * The one error body of backstop, used by the tRPC error formatter and by the batch writer, so a
 * bad input reads the same over every adapter. Internal errors never carry a stack or a message
 * from inside.
 */
export function errorBodyOf(err: unknown): ErrorBody {
  const cause = err instanceof TRPCError ? err.cause : err;
  if (cause instanceof ZodError) {
    const issues = issuesOf(cause.issues);
    const first = issues[0];
    const where = first ? `${pathText(first.path)}: ${first.message}` : "invalid input";
    return { code: "invalid-input", message: `invalid input at ${where}`, issues };
  }
  if (cause instanceof InputProblem) return { code: cause.code, message: cause.message, issues: cause.issues };
  if (err instanceof TRPCError && err.code === "NOT_FOUND") return { code: "unknown-procedure", message: err.message, issues: [{ path: ["procedure"], message: err.message }] };
  // a body tRPC could not read (not JSON, a bad batch): the fault is the input as a whole
  if (err instanceof TRPCError && err.code !== "INTERNAL_SERVER_ERROR") return { code: "invalid-input", message: err.message, issues: [{ path: [], message: err.message }] };
  return { code: "internal", message: "internal error: the request was not completed (logged on the server)", issues: [] };
}
