import { z } from "zod";
import { ERROR_CODES, issue } from "./outcome.js";

/** Error codes that only the HTTP edge produces (the analysis codes are in `outcome.ts`). */
export const EDGE_ERROR_CODES = [
  "malformed-json",
  "not-found",
  "method-not-allowed",
  "payload-too-large",
  "too-many-items",
  "unauthorized",
  "unavailable",
] as const;
export const PROBLEM_CODES = [...ERROR_CODES, ...EDGE_ERROR_CODES] as const;
export type ProblemCode = (typeof PROBLEM_CODES)[number];

/** RFC 9457 problem details, with backstop's error code and the field paths of the input. */
export const problem = z
  .object({
    type: z.string().meta({ description: "URI naming the problem type: urn:backstop:problem:<code>" }),
    title: z.string(),
    status: z.number().int().meta({ description: "the HTTP status code" }),
    detail: z.string(),
    instance: z.string().optional().meta({ description: "the request path" }),
    code: z.enum(PROBLEM_CODES),
    issues: z.array(issue).meta({ description: "each problem in the input, with its field path" }),
    requestId: z.string().optional(),
  })
  .meta({ description: "RFC 9457 problem details (application/problem+json)" });
export type Problem = z.infer<typeof problem>;

/** One item of a bulk answer, in the order of the request. */
export const bulkItem = z.discriminatedUnion("ok", [
  z.object({ ok: z.literal(true), result: z.unknown() }),
  z.object({ ok: z.literal(false), problem }),
]);
