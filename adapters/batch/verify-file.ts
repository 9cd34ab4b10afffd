import { createReadStream } from "node:fs";
import { createInterface } from "node:readline";
import type { Context } from "../../api/context.js";
import { errorBodyOf } from "../../api/error-body.js";
import { type Invoke, procedureInvoker } from "../../api/procedure-registry.js";
import { VERIFY_STATUSES, type VerifyOutput, type VerifyStatus } from "../../contracts/verify.js";
import { isBlankLine, MAX_LINE_CHARS } from "./line.js";

/** A report file's counts: each status, and the lines that were no filed record. */
export type VerifyCounts = Record<VerifyStatus | "unreadable", number>;

/** Statuses under which a filed verdict still holds as filed (exit 0 when every record has one). */
export const HOLDING: ReadonlySet<string> = new Set(["unchanged", "numbers-changed"]);

type ReportLine = { line: number; status: VerifyStatus | "unreadable" } & Record<string, unknown>;

/** One line of a records file → its report line. */
async function reportLine(raw: string, lineNo: number, verify: Invoke): Promise<ReportLine> {
  let id: unknown = null;
  const unreadable = (reason: string, error?: unknown): ReportLine => ({
    line: lineNo,
    id,
    status: "unreadable",
    reason,
    ...(error === undefined ? {} : { error }),
  });
  if (raw.length > MAX_LINE_CHARS) return unreadable(`line longer than ${MAX_LINE_CHARS} characters`);
  let rec: unknown;
  try {
    rec = JSON.parse(raw) as unknown;
  } catch (e) {
    return unreadable(`not JSON: ${(e as Error).message}`);
  }
  const obj = typeof rec === "object" && rec !== null && !Array.isArray(rec) ? (rec as Record<string, unknown>) : {};
  if ("id" in obj) id = obj.id;
  if (!("input" in obj) && "result" in obj)
    return unreadable(
      "a batch output line holds no input: file { id, procedure, input, result } (the input line with its result)",
    );
  try {
    const answer = (await verify({ records: [rec] })) as VerifyOutput;
    const { index: _, ...report } = answer.reports[0] as VerifyOutput["reports"][number];
    return { line: lineNo, ...report };
  } catch (e) {
    const error = errorBodyOf(e);
    return unreadable(`not a filed record: ${error.message}`, error);
  }
}

/**
 * `backstop verify`: each non-blank line of `inPath` a filed record `{ id?, procedure, input,
 * result }`, checked by the verify procedure one at a time (nothing held but the line), each
 * answered by one report line `{ line, ...report }`; a line that is no filed record by
 * `{ line, id, status: "unreadable", reason, error? }`.
 */
export async function verifyFile(
  inPath: string,
  write: (text: string) => Promise<void>,
  ctx: Context,
): Promise<VerifyCounts> {
  const verify = procedureInvoker(ctx)("verify");
  if (verify === undefined) throw new Error("the verify procedure is missing from the table");
  const counts = Object.fromEntries([...VERIFY_STATUSES, "unreadable"].map((s) => [s, 0])) as VerifyCounts;
  const lines = createInterface({ input: createReadStream(inPath), crlfDelay: Infinity });
  let lineNo = 0;
  for await (const raw of lines) {
    lineNo += 1;
    if (isBlankLine(raw)) continue;
    const out = await reportLine(raw, lineNo, verify);
    counts[out.status] += 1;
    await write(`${JSON.stringify(out)}\n`);
  }
  return counts;
}
