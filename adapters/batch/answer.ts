import type { Invoke } from "../../api/procedure-registry.js";
import type { Format } from "./formats.js";
import { linesOf } from "./jsonl-chunk.js";
import { type BatchOutputLine, isBlankLine, processLine } from "./line.js";

/** A shard of the input: record n (1-based) belongs to shard (n - 1) mod count. */
export interface Shard {
  readonly index: number;
  readonly count: number;
}

/** Does record `lineNo` belong to this run (no shard: every record does)? */
export const inShard = (lineNo: number, shard: Shard | undefined): boolean =>
  shard === undefined || (lineNo - 1) % shard.count === shard.index;

/**
 * Records as the reader hands them on (reader.ts): whole lines as UTF-8 bytes (a JSON Lines line
 * as read, a CSV row as the JSON line it makes), numbered from `firstLine` without a gap, and the
 * rows the reader answered itself (a line too long to hold, a CSV row that does not convert),
 * each in the place of an empty line of `bytes`.
 */
export interface RecordChunk {
  readonly bytes: Uint8Array;
  readonly firstLine: number;
  readonly lines: number;
  readonly answered?: readonly BatchOutputLine[] | undefined;
}

/** How every chunk of a run is answered: the output format, the procedures of its CSV columns, the shard and the reports. */
export interface ChunkOptions {
  readonly outFormat: Format;
  /** the procedures whose result columns a CSV output holds (formats.ts `resultColumns`; absent: every procedure's) */
  readonly columnsOf?: readonly string[] | undefined;
  readonly shard?: Shard | undefined;
  /**
   * Procedures whose answered rows are drawn as reports, each with the input flag that asks it for
   * the chart data (set on its lines where absent). Those rows also come back as records.
   */
  readonly reportFlags?: Readonly<Record<string, string>> | undefined;
}

/** A chunk with its options: what a thread is given. */
export type ChunkTask = RecordChunk & ChunkOptions;

/** An answered row of a report procedure: the record, and where its text lies in the chunk's output bytes. */
export interface ReportRow {
  readonly procedure: string;
  readonly row: Extract<BatchOutputLine, { ok: true }>;
  readonly at: number;
  readonly end: number;
}

/** A chunk's answer: its output records as UTF-8 bytes, and how many were written, answered and rejected. */
export interface ChunkAnswer {
  readonly bytes: Uint8Array;
  readonly lines: number;
  readonly ok: number;
  readonly failed: number;
  /** blank lines skipped (no record) */
  readonly blank: number;
  readonly reportRows?: readonly ReportRow[] | undefined;
}

/**
 * UTF-8 output written as it comes into one growing buffer: each record's text is encoded at once
 * and can die young. Row `batch-node22-paths` (Node 22): a chunk's texts kept and encoded at its
 * end ran at the same rate (0.94, 0.84-1.67) with 45 MB more peak RSS (319 against 274 MB,
 * medians), over the batch's 300 MB target in every round where this was under it. Three bytes per UTF-16 unit bound every code
 * point's encoding (a surrogate pair is 4 bytes for 2 units, a lone surrogate 3 for 1). The buffer
 * is never from Node's shared pool, so it can be transferred to another thread.
 */
export class Utf8Sink {
  private buf: Buffer;
  private at = 0;
  constructor(capacity: number) {
    this.buf = Buffer.allocUnsafeSlow(Math.max(capacity, 16 * 1024));
  }
  get length(): number {
    return this.at;
  }
  write(text: string): void {
    if (this.buf.length - this.at < text.length * 3) {
      const bigger = Buffer.allocUnsafeSlow(Math.max(2 * this.buf.length, this.at + text.length * 3));
      this.buf.copy(bigger, 0, 0, this.at);
      this.buf = bigger;
    }
    this.at += this.buf.write(text, this.at, "utf8");
  }
  bytes(): Buffer {
    return this.buf.subarray(0, this.at);
  }
}

/**
 * A line of a report procedure with its flag set (`curves: true` for a review, `waveform: true`
 * for bridgeAc) when its input is an object that does not set it; the line as it is otherwise.
 * `procedure`: the report procedure the line names, if it names one.
 */
export function withReportFlag(
  raw: string,
  flags: Readonly<Record<string, string>>,
): { raw: string; procedure: string | undefined } {
  let v: { procedure?: unknown; input?: unknown };
  try {
    v = JSON.parse(raw) as typeof v;
  } catch {
    return { raw, procedure: undefined };
  }
  const procedure = typeof v?.procedure === "string" && Object.hasOwn(flags, v.procedure) ? v.procedure : undefined;
  const flag = procedure === undefined ? undefined : flags[procedure];
  if (
    flag === undefined ||
    typeof v.input !== "object" ||
    v.input === null ||
    Array.isArray(v.input) ||
    flag in v.input
  )
    return { raw, procedure };
  return { raw: JSON.stringify({ ...v, input: { ...v.input, [flag]: true } }), procedure };
}

/**
 * Answer a chunk: each of its lines in the shard through `processLine` (blank lines skipped and
 * counted), written out with `line` (the output format) and encoded as UTF-8 into one buffer. The
 * same function runs in the worker threads and in the main thread, so both write the same bytes.
 * With `yieldEvery` > 0 it lets the event loop run (setImmediate) after every that many records.
 */
export async function answerChunk(
  c: ChunkTask,
  line: (o: BatchOutputLine) => string,
  invoker: (path: string) => Invoke | undefined,
  yieldEvery = 0,
): Promise<ChunkAnswer> {
  const text = Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength).toString("utf8");
  const raws = linesOf(text);
  const answered = c.answered === undefined ? undefined : new Map(c.answered.map((r) => [r.line, r]));
  const out = new Utf8Sink(text.length); // grows as the answers need
  const reportRows: ReportRow[] = [];
  let ok = 0;
  let lines = 0;
  let blank = 0;
  for (let i = 0; i < c.lines; i += 1) {
    const lineNo = c.firstLine + i;
    if (!inShard(lineNo, c.shard)) continue;
    let o = answered?.get(lineNo);
    let procedure: string | undefined;
    if (o === undefined) {
      let raw = raws[i] ?? "";
      if (isBlankLine(raw)) {
        blank += 1;
        continue;
      }
      if (c.reportFlags !== undefined) ({ raw, procedure } = withReportFlag(raw, c.reportFlags));
      o = await processLine(raw, lineNo, invoker);
    }
    if (o.ok) ok += 1;
    lines += 1;
    const at = out.length;
    out.write(line(o));
    if (procedure !== undefined && o.ok) reportRows.push({ procedure, row: o, at, end: out.length });
    if (yieldEvery > 0 && lines % yieldEvery === 0) await new Promise<void>((r) => setImmediate(r));
  }
  return { bytes: out.bytes(), lines, ok, failed: lines - ok, blank, ...(reportRows.length > 0 ? { reportRows } : {}) };
}
