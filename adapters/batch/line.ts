import { z } from "zod";
import { errorBodyOf } from "../../api/error-body.js";
import type { Invoke } from "../../api/procedure-registry.js";
import type { ErrorBody } from "../../contracts/outcome.js";

/** One input line: `{ "id"?: string|number, "procedure": "<router path>", "input": {...} }`. */
export const batchLine = z.strictObject({
  id: z.union([z.string().max(200), z.number()]).optional(),
  procedure: z.string().min(1).max(200),
  input: z.unknown(),
});

export type BatchOutputLine =
  | { readonly id: string | number | null; readonly line: number; readonly ok: true; readonly result: unknown }
  | { readonly id: string | number | null; readonly line: number; readonly ok: false; readonly error: ErrorBody };

export interface BatchCounts {
  /** rows answered (ok + failed) */
  lines: number;
  ok: number;
  failed: number;
  /** blank input lines: skipped, never a row */
  blank: number;
}

/** A line of nothing but whitespace: not a row (skipped and counted apart). */
export const isBlankLine = (raw: string): boolean => raw.trim() === "";

/** The longest input line answered, in UTF-16 units; a longer one is rejected (overlongLine). */
export const MAX_LINE_CHARS = 1_000_000;

/** The record for a line longer than MAX_LINE_CHARS (it is not parsed: no id). */
export function overlongLine(lineNo: number): BatchOutputLine {
  return {
    id: null,
    line: lineNo,
    ok: false,
    error: { code: "malformed-line", message: `line longer than ${MAX_LINE_CHARS} characters`, issues: [] },
  };
}

/** Process one raw line into exactly one output record; never rejects. */
export async function processLine(
  raw: string,
  lineNo: number,
  invoker: (path: string) => Invoke | undefined,
): Promise<BatchOutputLine> {
  let parsedJson: unknown;
  const fail = (id: string | number | null, error: ErrorBody): BatchOutputLine => ({
    id,
    line: lineNo,
    ok: false,
    error,
  });
  if (raw.trim() === "") return fail(null, { code: "malformed-line", message: "empty line", issues: [] });
  if (raw.length > MAX_LINE_CHARS) return overlongLine(lineNo);
  try {
    parsedJson = JSON.parse(raw);
  } catch (e) {
    return fail(null, { code: "malformed-line", message: `not JSON: ${(e as Error).message}`, issues: [] });
  }
  const checked = batchLine.safeParse(parsedJson); // a bad line: zod names what is wrong
  if (!checked.success) {
    const id =
      typeof parsedJson === "object" && parsedJson !== null && "id" in parsedJson
        ? idOf((parsedJson as { id: unknown }).id)
        : null;
    return fail(id, errorBodyOf(checked.error));
  }
  const line = checked.data;
  const id = line.id ?? null;
  const invoke = invoker(line.procedure);
  if (invoke === undefined) {
    return fail(id, {
      code: "unknown-procedure",
      message: `no procedure "${line.procedure}"`,
      issues: [{ path: ["procedure"], message: "unknown procedure" }],
    });
  }
  try {
    return { id, line: lineNo, ok: true, result: await invoke(line.input) };
  } catch (e) {
    return fail(id, errorBodyOf(e));
  }
}

function idOf(v: unknown): string | number | null {
  return typeof v === "string" || typeof v === "number" ? v : null;
}

/** The id of a raw line, if it parses that far (for a row whose answer was lost with its thread). */
export function idOfRaw(raw: string): string | number | null {
  try {
    const v = JSON.parse(raw) as unknown;
    return typeof v === "object" && v !== null && "id" in v ? idOf((v as { id: unknown }).id) : null;
  } catch {
    return null;
  }
}
