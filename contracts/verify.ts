import { z } from "zod";
import { LIMITS, limitMessage } from "./limits.js";
import { errorBody } from "./outcome.js";

/**
 * A filed result: the procedure, its input as it was sent and the result as it was answered, its
 * verdict record included (a batch input line `{ id, procedure, input }` with its output line's
 * `result` added). A batch output line alone holds no input, so it cannot be recomputed.
 */
export const filedRecord = z
  .strictObject({
    id: z.union([z.string().max(200), z.number()]).optional(),
    procedure: z.string().min(1).max(200),
    input: z.unknown(),
    result: z.record(z.string(), z.unknown()),
  })
  .meta({ description: "a filed result: { id?, procedure, input (as sent), result (as answered, with its record) }" });
export type FiledRecord = z.infer<typeof filedRecord>;

export const verifyInput = z
  .strictObject({
    records: z
      .array(filedRecord)
      .min(1)
      .max(LIMITS.maxVerifyRecords, { error: limitMessage("maxVerifyRecords", "records in one verify") }),
  })
  .meta({
    description:
      "Check filed results: each record's signature and digests, then the result recomputed under today's models, rules and catalog",
  });

/** What verify says of one filed record, worst first where several apply (README, "Verdict records"). */
export const VERIFY_STATUSES = [
  "signature-failed",
  "tampered",
  "no-record",
  "recompute-failed",
  "verdict-changed",
  "numbers-changed",
  "unchanged",
] as const;
export type VerifyStatus = (typeof VERIFY_STATUSES)[number];

const RECORD_FIELDS = ["inputSha256", "ruleSets", "catalog", "fits", "modelVersion", "buildVersion"] as const;

export const verifyReport = z.object({
  index: z.number().int().meta({ description: "the record's place in records (0-based)" }),
  id: z.union([z.string(), z.number()]).optional(),
  procedure: z.string(),
  status: z.enum(VERIFY_STATUSES),
  reason: z.string(),
  signature: z
    .enum(["valid", "invalid", "unsigned", "unknown-key"])
    .optional()
    .meta({ description: "unknown-key: signed with a key this service does not hold (absent: no record)" }),
  digests: z
    .object({ sent: z.enum(["match", "mismatch"]), result: z.enum(["match", "mismatch"]) })
    .optional()
    .meta({
      description: "the record's sentSha256 against the filed input, its resultSha256 against the filed result",
    }),
  identical: z.boolean().optional().meta({ description: "the recomputed result has the filed result's digest" }),
  moved: z
    .array(z.enum(RECORD_FIELDS))
    .optional()
    .meta({ description: "fields of today's record that differ from the filed one (a part's data: inputSha256)" }),
  verdict: z
    .object({
      path: z.string().meta({ description: "the least nested verdict that moved" }),
      from: z.string().nullable(),
      to: z.string().nullable(),
      rules: z.array(z.string()).meta({ description: "ids of the rules whose outcome moved anywhere in the result" }),
      changed: z.number().int().meta({ description: "verdicts that moved" }),
    })
    .optional(),
  numbers: z
    .object({
      changed: z.number().int(),
      largestRelativeChange: z.number().meta({ description: "|new - filed| / max(|new|, |filed|) at path" }),
      path: z.string(),
    })
    .optional(),
  fields: z
    .object({ changed: z.number().int(), path: z.string() })
    .optional()
    .meta({ description: "other values (texts, flags, fields added or gone) that differ; the first at path" }),
  error: errorBody.optional().meta({ description: "why the recomputation was refused (recompute-failed)" }),
});
export type VerifyReport = z.infer<typeof verifyReport>;

export const verifyOutput = z.object({
  reports: z.array(verifyReport),
  counts: z.record(z.enum(VERIFY_STATUSES), z.number().int()),
});
export type VerifyOutput = z.infer<typeof verifyOutput>;
