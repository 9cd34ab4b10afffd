import { z } from "zod";
import { verdictRecord } from "./record.js";

/** Error codes of the service edge, one closed list. */
export const ERROR_CODES = [
  "invalid-input",
  "unknown-part",
  "unknown-procedure",
  "fit-failed",
  "malformed-line",
  "unknown-rule-set",
  "invalid-rule-set",
  "limit-exceeded",
  "answer-too-large",
  "compute-timeout",
  "report-failed",
  "internal",
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export const issue = z.object({
  path: z.array(z.union([z.string(), z.number()])).meta({ description: "where in the input the problem is" }),
  message: z.string(),
});
export type Issue = z.infer<typeof issue>;

export const errorBody = z.object({
  code: z.enum(ERROR_CODES),
  message: z.string(),
  issues: z.array(issue),
});
export type ErrorBody = z.infer<typeof errorBody>;

/**
 * Stamped on every analysis result. `record` is added by the one call definition
 * (api/procedure-registry.ts) to every result that carries `modelVersion`; a handler never writes it.
 */
export const provenance = {
  modelVersion: z.string().meta({ description: "version of backstop's models" }),
  caution: z.string(),
  record: verdictRecord,
};
