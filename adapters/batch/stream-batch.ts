import type { Readable } from "node:stream";
import { parse } from "csv-parse";
import type { Context } from "../../api/context.js";
import type { ErrorBody } from "../../contracts/outcome.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import type { ComputePool, FormattedLine, LinesFormat } from "../compute/pool.js";
import { utf8Join } from "../utf8-join.js";
import { csvHeaderProblem, csvRowToLine, type Format, outputFormatter } from "./formats.js";
import { answerJsonlChunk, type ChunkAnswer, inShard, type JsonlChunk, jsonlChunks, linesOf, type Shard } from "./jsonl-chunk.js";
import { type BatchCounts, type BatchOutputLine, isBlankLine, overlongLine, processLine } from "./run-batch.js";

export type { Shard } from "./jsonl-chunk.js";

export interface StreamBatchOptions {
  readonly input: Readable;
  readonly inFormat: Format;
  readonly outFormat: Format;
  /** write one chunk of output (text, or its UTF-8 bytes); resolves when it may write more (backpressure) */
  readonly write: (chunk: string | Uint8Array) => Promise<void>;
  readonly ctx: Context;
  readonly procedure?: string | undefined;
  readonly shard?: Shard | undefined;
  readonly pool?: ComputePool | undefined;
  readonly onProgress?: (counts: BatchCounts) => void;
  /** records per pool task (CSV input, or with a row hook) */
  readonly chunkSize?: number;
  /** input bytes per chunk (JSON Lines input without a row hook) */
  readonly chunkBytes?: number;
  /** called for each answered record, in input order, with the procedure its line named (if it parsed that far) */
  readonly onRow?: RowHook | undefined;
  /**
   * JSON Lines chunks only in the pool, none in this thread (with a pool). For the fault suite:
   * a small input would otherwise be answered here before a thread has started.
   */
  readonly poolOnly?: boolean | undefined;
  /** ask every review line for its chart sweeps (`curves: true`) and every bridgeAc line for its period (`waveform: true`), for reports */
  readonly reviewCurves?: boolean | undefined;
}

/** A review line with `input.curves` set (when the line asks nothing else of it); other lines as they are. */
function withReviewCurves(rec: Rec): Rec {
  if (!("raw" in rec)) return rec;
  try {
    const v = JSON.parse(rec.raw) as { procedure?: unknown; input?: unknown };
    // A review's report draws its sweeps (curves), a bridgeAc report its period (waveform).
    const flag = v.procedure === "review" ? "curves" : v.procedure === "bridgeAc" ? "waveform" : undefined;
    if (flag === undefined || typeof v.input !== "object" || v.input === null || Array.isArray(v.input) || flag in v.input) return rec;
    return { lineNo: rec.lineNo, raw: JSON.stringify({ ...v, input: { ...v.input, [flag]: true } }) };
  } catch {
    return rec;
  }
}

/**
 * Called for each answered record before it is written; an error body returned (a report that
 * could not be drawn) is written as that line's error row in place of its result, and the batch goes on.
 */
export type RowHook = (row: BatchOutputLine, procedure: string | undefined) => undefined | ErrorBody | Promise<undefined | ErrorBody>;

function procedureOf(rec: Rec): string | undefined {
  if (!("raw" in rec)) return undefined;
  try {
    const v = JSON.parse(rec.raw) as unknown;
    return typeof v === "object" && v !== null && "procedure" in v && typeof v.procedure === "string" ? v.procedure : undefined;
  } catch {
    return undefined;
  }
}

type Rec = { lineNo: number; raw: string } | { lineNo: number; out: BatchOutputLine };

/**
 * JSON Lines records for the per-record path (a row hook, reports), the lines as readline reads
 * them, taken from the same byte chunks as the chunked path: a line of more than MAX_LINE_BYTES is
 * answered as too long without being held (readline held it whole, so a file without line breaks
 * could stop the run).
 */
async function* jsonlRecords(input: Readable, counts: BatchCounts): AsyncGenerator<Rec> {
  for await (const c of jsonlChunks(input, RECORD_CHUNK_BYTES)) {
    if (c.overlongBytes !== undefined) {
      yield { lineNo: c.firstLine, out: overlongLine(c.firstLine) };
      continue;
    }
    const raws = linesOf(Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength).toString("utf8"));
    for (let i = 0; i < raws.length; i += 1) {
      if (isBlankLine(raws[i] as string)) counts.blank += 1;
      else yield { lineNo: c.firstLine + i, raw: raws[i] as string };
    }
  }
}

/** Input bytes decoded at once by the per-record path. */
const RECORD_CHUNK_BYTES = 64 * 1024;

async function* csvRecords(input: Readable, procedure: string | undefined, counts: BatchCounts): AsyncGenerator<Rec> {
  const parser = input.pipe(parse({ bom: true, relax_column_count: true, skip_empty_lines: false }));
  let header: string[] | undefined;
  let n = 0;
  for await (const cells of parser as AsyncIterable<string[]>) {
    if (header === undefined) {
      header = cells.map((h) => h.trim());
      const problem = csvHeaderProblem(header, procedure);
      if (problem !== undefined) throw new Error(problem);
      continue;
    }
    n += 1;
    if (cells.every((c) => c.trim() === "")) {
      counts.blank += 1;
      continue;
    }
    const r = csvRowToLine(header, cells, procedure);
    yield "raw" in r ? { lineNo: n, raw: r.raw } : { lineNo: n, out: { id: r.id, line: n, ok: false, error: r.error } };
  }
}

/**
 * A chunk in the pool; if its task fails (the worker thread threw or died), each record is retried
 * alone, so only the records that fail again are reported (as internal errors) and the run goes on.
 */
async function linesInPool(pool: ComputePool, todo: { lineNo: number; raw: string }[], fmt: Formatter, format: LinesFormat): Promise<FormattedLine[]> {
  try {
    return await pool.lines(todo, format);
  } catch {
    const out: FormattedLine[] = [];
    for (const r of todo) {
      try {
        out.push(...(await pool.lines([r], format)));
      } catch (e) {
        const failed: BatchOutputLine = { id: idOfRaw(r.raw), line: r.lineNo, ok: false, error: { code: "internal", message: `the worker thread failed on this record: ${(e as Error).message}`.slice(0, 500), issues: [] } };
        out.push({ ok: false, text: fmt.line(failed), ...(format.withRecords ? { record: failed } : {}) });
      }
    }
    return out;
  }
}

type Formatter = ReturnType<typeof outputFormatter>;

function idOfRaw(raw: string): string | number | null {
  try {
    const id = (JSON.parse(raw) as { id?: unknown }).id;
    return typeof id === "string" || typeof id === "number" ? id : null;
  } catch {
    return null;
  }
}

/** The chunk's output lines as UTF-8 (see utf8Join). */
export function utf8Of(outs: readonly FormattedLine[]): Buffer {
  return utf8Join(outs.map((o) => o.text));
}

/**
 * The batch engine: stream records in (JSON Lines or CSV), answer each with the router (in worker
 * threads when a pool is given), write one output record per input record in input order. Memory
 * stays bounded: at most `2 × threads` chunks are in flight.
 */
export async function streamBatch(o: StreamBatchOptions): Promise<BatchCounts> {
  if (o.inFormat === "jsonl" && o.onRow === undefined && !o.reviewCurves) return streamJsonlChunks(o);
  const counts: BatchCounts = { lines: 0, ok: 0, failed: 0, blank: 0 };
  const fmt = outputFormatter(o.outFormat, o.procedure);
  if (fmt.header) await o.write(fmt.header);
  const invoker = o.pool ? undefined : procedureInvoker(o.ctx);
  const chunkSize = o.chunkSize ?? 64;
  const maxInFlight = Math.max(2, 2 * (o.pool?.threads ?? 1));
  const queue: { recs: Rec[]; outs: Promise<FormattedLine[]> }[] = [];
  const withRecords = o.onRow !== undefined;
  const written = (out: BatchOutputLine): FormattedLine => ({ ok: out.ok, text: fmt.line(out), ...(withRecords ? { record: out } : {}) });

  const answer = async (chunk: Rec[]): Promise<FormattedLine[]> => {
    const todo = chunk.filter((r): r is { lineNo: number; raw: string } => "raw" in r);
    let done: FormattedLine[];
    if (o.pool) done = todo.length > 0 ? await linesInPool(o.pool, todo, fmt, { outFormat: o.outFormat, procedure: o.procedure, withRecords }) : [];
    else {
      done = [];
      for (const r of todo) done.push(written(await processLine(r.raw, r.lineNo, invoker as NonNullable<typeof invoker>)));
    }
    let k = 0;
    return chunk.map((r) => ("out" in r ? written(r.out) : (done[k++] as FormattedLine)));
  };
  const enqueue = (c: Rec[]) => {
    const p = answer(c);
    p.catch(() => undefined); // awaited in order by flushHead; this only keeps an early rejection from going unhandled
    queue.push({ recs: c, outs: p });
  };
  const flushHead = async () => {
    const head = queue.shift() as { recs: Rec[]; outs: Promise<FormattedLine[]> };
    const outs = await head.outs;
    if (o.onRow) {
      for (const [i, out] of outs.entries()) {
        const row = out.record as BatchOutputLine;
        const refused = await o.onRow(row, procedureOf(head.recs[i] as Rec));
        if (refused !== undefined) outs[i] = written({ id: row.id, line: row.line, ok: false, error: refused });
      }
    }
    for (const out of outs) {
      counts.lines += 1;
      if (out.ok) counts.ok += 1;
      else counts.failed += 1;
    }
    if (outs.length > 0) await o.write(utf8Of(outs));
    o.onProgress?.(counts);
  };

  const source = o.inFormat === "csv" ? csvRecords(o.input, o.procedure, counts) : jsonlRecords(o.input, counts);
  let chunk: Rec[] = [];
  for await (const rec of source) {
    if (o.shard && (rec.lineNo - 1) % o.shard.count !== o.shard.index) continue;
    chunk.push(o.reviewCurves ? withReviewCurves(rec) : rec);
    if (chunk.length >= chunkSize) {
      enqueue(chunk);
      chunk = [];
      if (queue.length >= maxInFlight) await flushHead();
    }
  }
  if (chunk.length > 0) enqueue(chunk);
  while (queue.length > 0) await flushHead();
  return counts;
}

/**
 * A chunk in the pool; if its task fails (the worker thread threw or died), each of its records is
 * retried alone, so only the records that fail again are reported (as internal errors) and the run goes on.
 */
async function chunkInPool(pool: ComputePool, c: JsonlChunk, o: StreamBatchOptions, fmt: Formatter): Promise<ChunkAnswer> {
  const task = { outFormat: o.outFormat, procedure: o.procedure, shard: o.shard };
  // a copy in a buffer of its own, transferred to the thread (c.bytes stays here for the retry)
  try {
    return await pool.jsonlChunk({ ...task, bytes: new Uint8Array(c.bytes), firstLine: c.firstLine });
  } catch {
    const raws = linesOf(Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength).toString("utf8"));
    const parts: Uint8Array[] = [];
    let ok = 0;
    let lines = 0;
    let blank = 0;
    for (const [i, raw] of raws.entries()) {
      const lineNo = c.firstLine + i;
      if (!inShard(lineNo, o.shard)) continue;
      if (isBlankLine(raw)) {
        blank += 1;
        continue;
      }
      try {
        const one = await pool.jsonlChunk({ ...task, bytes: new Uint8Array(Buffer.from(raw, "utf8")), firstLine: lineNo, shard: undefined });
        parts.push(one.bytes);
        ok += one.ok;
        lines += one.lines;
      } catch (e) {
        const failed: BatchOutputLine = { id: idOfRaw(raw), line: lineNo, ok: false, error: { code: "internal", message: `the worker thread failed on this record: ${(e as Error).message}`.slice(0, 500), issues: [] } };
        parts.push(Buffer.from(fmt.line(failed), "utf8"));
        lines += 1;
      }
    }
    return { bytes: Buffer.concat(parts), lines, ok, failed: lines - ok, blank };
  }
}

/** Records this thread answers between two turns of the event loop when it shares the work with a pool. */
const YIELD_EVERY_LINES = 64;

/** Chunks given to each pool thread at once (posted to it together), so it never waits for this thread to hand it the next. */
export const CHUNKS_PER_THREAD = 2;

/**
 * Chunks read and not yet written, beyond those the pool holds: this thread's own and those
 * waiting to be taken or written. Eight chunks of 256 kB are about 2 MB of input and 10 MB of output.
 */
const CHUNKS_AHEAD = 6;

interface Slot {
  readonly chunk: JsonlChunk;
  answer?: ChunkAnswer;
}

/**
 * JSON Lines in, no row hook: the input goes in chunks of whole lines as bytes to the threads, each
 * coming back as its output bytes, written in input order. Chunks are handed out as they are
 * taken, not when they are read: each pool thread holds up to CHUNKS_PER_THREAD, and this thread
 * answers the oldest chunk nobody holds whenever it is free (without a pool, every chunk). So both
 * threads of a two-core machine compute from start to end: this one while the pool's threads
 * start, and whichever is free at the end. Reading, handing out and writing run between this
 * thread's records (it lets the event loop run every YIELD_EVERY_LINES records). At most
 * `CHUNKS_PER_THREAD × threads + CHUNKS_AHEAD` chunks are read and not yet written.
 */
async function streamJsonlChunks(o: StreamBatchOptions): Promise<BatchCounts> {
  const counts: BatchCounts = { lines: 0, ok: 0, failed: 0, blank: 0 };
  const fmt = outputFormatter(o.outFormat, o.procedure);
  if (fmt.header) await o.write(fmt.header);
  const pool = o.pool;
  const poolRoom = CHUNKS_PER_THREAD * (pool?.threads ?? 0);
  const window = poolRoom + CHUNKS_AHEAD;
  let invoker: ReturnType<typeof procedureInvoker> | undefined;

  const slots: Slot[] = []; // read and not yet written, in input order
  const untaken: Slot[] = []; // of those, the ones no thread holds yet, oldest first
  let inPool = 0;
  // Chunks go to the pool once a thread has started: until then this thread answers them (a chunk
  // handed to a starting thread would hold up the output behind it while this thread waits).
  let poolUp = false;
  let reading = false;
  let readDone = false;
  let writing = false;
  let failure: { error: unknown } | undefined;
  let wake: (() => void) | undefined;
  const signal = () => {
    const w = wake;
    wake = undefined;
    w?.();
  };
  const fail = (error: unknown) => {
    failure ??= { error };
    signal();
  };
  const finished = (s: Slot, a: ChunkAnswer) => {
    s.answer = a;
    pumpWrite();
  };

  const reader = jsonlChunks(o.input, o.chunkBytes ?? 256 * 1024)[Symbol.asyncIterator]();
  const pumpRead = () => {
    if (reading || readDone || failure !== undefined || slots.length >= window) return;
    reading = true;
    reader.next().then((r) => {
      reading = false;
      if (r.done === true) readDone = true;
      else {
        const c = r.value;
        const s: Slot = { chunk: c };
        slots.push(s);
        if (c.overlongBytes !== undefined) {
          // a line too long to hold: its record is written here (its bytes were not kept)
          const inRun = inShard(c.firstLine, o.shard);
          finished(s, { bytes: inRun ? Buffer.from(fmt.line(overlongLine(c.firstLine)), "utf8") : new Uint8Array(0), lines: inRun ? 1 : 0, ok: 0, failed: inRun ? 1 : 0, blank: 0 });
        } else untaken.push(s);
        pumpPool();
        pumpRead();
      }
      signal();
    }, fail);
  };
  const pumpPool = () => {
    while (pool !== undefined && poolUp && failure === undefined && inPool < poolRoom && untaken.length > 0) {
      const s = untaken.shift() as Slot;
      inPool += 1;
      chunkInPool(pool, s.chunk, o, fmt).then((a) => {
        inPool -= 1;
        finished(s, a);
        pumpPool();
      }, fail);
    }
  };
  const pumpWrite = () => {
    if (writing || failure !== undefined || slots[0]?.answer === undefined) return;
    writing = true;
    writeHeads().then(signal, fail);
  };
  // Writes the answered chunks at the head, in order; `writing` is cleared in the same turn as the
  // last head is found unanswered, so an answer that comes after it starts the writer again.
  const writeHeads = async () => {
    try {
      for (let head = slots[0]; head?.answer !== undefined; head = slots[0]) {
        const a = head.answer;
        slots.shift();
        counts.lines += a.lines;
        counts.ok += a.ok;
        counts.failed += a.failed;
        counts.blank += a.blank;
        pumpRead();
        if (a.bytes.length > 0) await o.write(a.bytes);
        o.onProgress?.(counts);
      }
    } finally {
      writing = false;
    }
  };
  const check = () => {
    if (failure !== undefined) throw failure.error;
  };
  // a thread that cannot start fails its chunks too, and chunkInPool answers their records one by one
  const up = () => {
    poolUp = true;
    pumpPool();
  };
  pool?.ready().then(up, up);
  pumpRead();
  try {
    for (;;) {
      check();
      const s = pool !== undefined && o.poolOnly === true ? undefined : untaken.shift();
      if (s !== undefined) {
        // the oldest chunk no thread holds: answered here
        invoker ??= procedureInvoker(o.ctx); // built only if this thread answers a chunk
        const c = s.chunk;
        const text = Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength).toString("utf8");
        finished(s, await answerJsonlChunk(text, c.firstLine, fmt.line, invoker, o.shard, pool === undefined ? 0 : YIELD_EVERY_LINES));
        // the pool's answers, its start and the reads are events: let them in between chunks too
        if (pool !== undefined) await new Promise<void>((r) => setImmediate(r));
        continue;
      }
      if (readDone && slots.length === 0 && !writing) break;
      await new Promise<void>((r) => (wake = r));
    }
    check();
  } catch (e) {
    failure ??= { error: e }; // stops reading and writing
    if (!readDone) void reader.return(undefined).catch(() => undefined);
    throw e;
  }
  return counts;
}
