import {
  type FiledRecord,
  VERIFY_STATUSES,
  type VerifyReport,
  type VerifyStatus,
  verifyInput,
  verifyOutput,
} from "../../contracts/verify.js";
import type { Context } from "../context.js";
import { defineProcedure } from "../define-procedure.js";
import { errorBodyOf } from "../error-body.js";
import { callProcedure, isThenable } from "../procedure-registry.js";
import { diffResults } from "../record/result-diff.js";
import { sha256Of, signedText, withoutRecord } from "../record/verdict-record.js";

type Rec = Readonly<Record<string, unknown>>;
const isObject = (v: unknown): v is Rec => typeof v === "object" && v !== null && !Array.isArray(v);

const MOVABLE = ["inputSha256", "ruleSets", "catalog", "fits", "modelVersion", "buildVersion"] as const;

/** The signature's state: valid, invalid, unsigned, or made with a key this service does not hold. */
function signatureOf(record: Rec, ctx: Context): NonNullable<VerifyReport["signature"]> {
  const sig = record.signature;
  if (sig === undefined) return "unsigned";
  if (!isObject(sig) || sig.alg !== "Ed25519" || typeof sig.keyId !== "string" || typeof sig.value !== "string")
    return "invalid";
  const signer = ctx.recordSigner;
  if (signer === undefined || signer.keyId !== sig.keyId) return "unknown-key";
  try {
    return signer.verify(signedText(record), sig.value) ? "valid" : "invalid";
  } catch {
    return "invalid";
  }
}

/** The report of one recomputed record: today's result against the filed one. */
function compared(head: VerifyReport, filedRecord: Rec, filed: Rec, today: unknown): VerifyReport {
  if (!isObject(today) || !isObject(today.record))
    return { ...head, status: "recompute-failed", reason: `${head.procedure} no longer answers with a verdict record` };
  const record = today.record;
  const moved = MOVABLE.filter((f) => JSON.stringify(record[f]) !== JSON.stringify(filedRecord[f]));
  const identical = record.resultSha256 === filedRecord.resultSha256;
  const base = { ...head, identical, moved: [...moved] };
  if (identical) return { ...base, status: "unchanged", reason: "today's result is byte for byte the filed one" };
  const diff = diffResults(withoutRecord(filed), withoutRecord(today));
  const movedText = moved.length === 0 ? "" : `; moved since: ${moved.join(", ")}`;
  if (diff.verdict !== undefined) {
    const v = diff.verdict;
    return {
      ...base,
      ...diff,
      status: "verdict-changed",
      reason: `${v.path}: ${v.from ?? "(absent)"} -> ${v.to ?? "(absent)"}${v.rules.length === 0 ? "" : ` (rules ${v.rules.join(", ")})`}${movedText}`,
    };
  }
  if (diff.numbers !== undefined) {
    const n = diff.numbers;
    return {
      ...base,
      ...diff,
      status: "numbers-changed",
      reason: `verdicts the same; ${n.changed} numbers changed, the most at ${n.path} (${(n.largestRelativeChange * 100).toPrecision(3)} %)${movedText}`,
    };
  }
  return {
    ...base,
    ...diff,
    status: "unchanged",
    reason: `verdicts and numbers the same${diff.fields === undefined ? "" : `; ${diff.fields.changed} other values differ, first at ${diff.fields.path}`}${movedText}`,
  };
}

/** Check one filed record: signature, digests, then the recomputation (a promise where the procedure answers with one). */
function verifyOne(rec: FiledRecord, index: number, ctx: Context): VerifyReport | Promise<VerifyReport> {
  const head: VerifyReport = {
    index,
    ...(rec.id === undefined ? {} : { id: rec.id }),
    procedure: rec.procedure,
    status: "unchanged",
    reason: "",
  };
  const record = rec.result.record;
  if (!isObject(record))
    return { ...head, status: "no-record", reason: "the filed result holds no verdict record: nothing to check it by" };
  const signature = signatureOf(record, ctx);
  if (signature === "invalid" || signature === "unknown-key")
    return {
      ...head,
      status: "signature-failed",
      signature,
      reason:
        signature === "invalid"
          ? "the signature does not match the record"
          : `signed with key ${String((record.signature as Rec).keyId)}; this service holds ${ctx.recordSigner?.keyId ?? "no key"}`,
    };
  const digests = {
    sent: sha256Of(rec.input) === record.sentSha256 ? "match" : "mismatch",
    result:
      sha256Of(withoutRecord(rec.result)) === record.resultSha256 && record.procedure === rec.procedure
        ? "match"
        : "mismatch",
  } as const;
  const checked = { ...head, signature, digests };
  if (digests.sent === "mismatch" || digests.result === "mismatch")
    return {
      ...checked,
      status: "tampered",
      reason: `the filed ${digests.sent === "mismatch" ? "input" : "result"} is not the one recorded${digests.sent === "mismatch" && digests.result === "mismatch" ? " (nor the result)" : ""}`,
    };
  const refused = (e: unknown): VerifyReport => {
    const error = errorBodyOf(e);
    return { ...checked, status: "recompute-failed", reason: `recomputing was refused: ${error.message}`, error };
  };
  let today: unknown;
  try {
    today = callProcedure(rec.procedure, ctx, rec.input);
  } catch (e) {
    return refused(e);
  }
  return isThenable(today)
    ? Promise.resolve(today).then((t) => compared(checked, record, rec.result, t), refused)
    : compared(checked, record, rec.result, today);
}

/**
 * verify: each filed record's signature and digests checked, then its result recomputed under
 * today's models, rules and catalog (through the one call definition) and compared with the filed one.
 */
export const verify = defineProcedure({
  name: "verify",
  input: verifyInput,
  output: verifyOutput,
  handler: ({ input, ctx }) => {
    const answers = input.records.map((rec, i) => verifyOne(rec, i, ctx));
    // synchronous where every recomputation is (every procedure's today), as the other procedures answer
    return answers.some(isThenable) ? Promise.all(answers).then(summary) : summary(answers as VerifyReport[]);
  },
});

/** The reports with the count of each status. */
function summary(reports: VerifyReport[]): { reports: VerifyReport[]; counts: Record<VerifyStatus, number> } {
  const counts = Object.fromEntries(VERIFY_STATUSES.map((s) => [s, 0])) as Record<VerifyStatus, number>;
  for (const r of reports) counts[r.status] += 1;
  return { reports, counts };
}
