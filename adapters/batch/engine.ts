import type { Readable } from "node:stream";
import type { Context } from "../../api/context.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import type { ErrorBody } from "../../contracts/outcome.js";
import type { ComputePool } from "../compute/pool.js";
import {
  answerChunk,
  type ChunkAnswer,
  type ChunkOptions,
  type RecordChunk,
  type ReportRow,
  type Shard,
} from "./answer.js";
import { type Format, outputFormatter } from "./formats.js";
import { answerInPool } from "./in-pool.js";
import type { BatchCounts, BatchOutputLine } from "./line.js";
import { recordChunks } from "./reader.js";

/**
 * Called for each answered row of a report procedure, in input order, before it is written; an
 * error body returned (a report that could not be drawn) is written as that line's error row in
 * place of its result, and the batch goes on.
 */
export type RowHook = (
  row: Extract<BatchOutputLine, { ok: true }>,
  procedure: string,
) => undefined | ErrorBody | Promise<undefined | ErrorBody>;

export interface StreamBatchOptions {
  readonly input: Readable;
  readonly inFormat: Format;
  readonly outFormat: Format;
  /** write one chunk of output (text, or its UTF-8 bytes); resolves when it may write more (backpressure) */
  readonly write: (chunk: string | Uint8Array) => Promise<void>;
  readonly ctx: Context;
  readonly procedure?: string | undefined;
  /**
   * Without `procedure`: the procedures the input names (output-procedures.ts), whose result columns a
   * CSV output's header holds (absent: every procedure's)
   */
  readonly outputProcedures?: readonly string[] | undefined;
  readonly shard?: Shard | undefined;
  readonly pool?: ComputePool | undefined;
  readonly onProgress?: (counts: BatchCounts) => void;
  /** the input file's folder: curve file references (`{ "csv": ... }`) are read from it (absent: refused by the contracts) */
  readonly curveFolder?: string | undefined;
  /** input bytes per chunk (default 256 kB) */
  readonly chunkBytes?: number;
  /** reports: the procedures drawn, each with the input flag that asks for its chart data, and the hook that draws a row */
  readonly reports?: { readonly flags: Readonly<Record<string, string>>; readonly onRow: RowHook } | undefined;
  /**
   * Every chunk in the pool, none in this thread (with a pool). For the fault suite: a small input
   * would otherwise be answered here before a thread has started.
   */
  readonly poolOnly?: boolean | undefined;
}

/** Records this thread answers between two turns of the event loop when it shares the work with a pool. */
const YIELD_EVERY_LINES = 64;

/**
 * Chunks read and not yet written, beyond those the pool holds (one a thread): this thread's own
 * and those waiting to be taken or written.
 */
const CHUNKS_AHEAD = 6;

interface Slot {
  readonly chunk: RecordChunk;
  answer?: ChunkAnswer;
}

/**
 * The batch engine: records in (reader.ts: JSON Lines or CSV, in chunks of whole records), one
 * output record per input record out, in input order. Chunks are handed out as they are taken,
 * not when they are read: each pool thread holds one, and this thread
 * answers the oldest chunk nobody holds whenever it is free (without a pool, every chunk), with
 * the same function as the threads (answerChunk). So both threads of a two-core machine compute
 * from start to end: this one while the pool's threads start, and whichever is free at the end.
 * Reading, handing out and writing run between this thread's records (it lets the event loop run
 * every YIELD_EVERY_LINES records). At most `threads + CHUNKS_AHEAD` chunks
 * are read and not yet written.
 */
export async function streamBatch(o: StreamBatchOptions): Promise<BatchCounts> {
  const counts: BatchCounts = { lines: 0, ok: 0, failed: 0, blank: 0 };
  const columnsOf = o.procedure === undefined ? o.outputProcedures : [o.procedure];
  const fmt = outputFormatter(o.outFormat, columnsOf);
  if (fmt.header) await o.write(fmt.header);
  const options: ChunkOptions = {
    outFormat: o.outFormat,
    columnsOf,
    shard: o.shard,
    reportFlags: o.reports?.flags,
  };
  const pool = o.pool;
  const poolRoom = pool?.threads ?? 0;
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

  const reader = recordChunks(o.input, o.inFormat, {
    targetBytes: o.chunkBytes ?? 256 * 1024,
    procedure: o.procedure,
    shard: o.shard,
    curveFolder: o.curveFolder,
  })[Symbol.asyncIterator]();
  const pumpRead = () => {
    if (reading || readDone || failure !== undefined || slots.length >= window) return;
    reading = true;
    reader.next().then((r) => {
      reading = false;
      if (r.done === true) readDone = true;
      else {
        const s: Slot = { chunk: r.value };
        slots.push(s);
        untaken.push(s);
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
      answerInPool(pool, s.chunk, options, fmt.line).then((a) => {
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
        pumpRead();
        await writeAnswer(a, o, fmt.line, counts);
        o.onProgress?.(counts);
      }
    } finally {
      writing = false;
    }
  };
  const check = () => {
    if (failure !== undefined) throw failure.error;
  };
  // a thread that cannot start fails its chunks too, and answerInPool answers their rows one by one
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
        finished(
          s,
          await answerChunk({ ...options, ...s.chunk }, fmt.line, invoker, pool === undefined ? 0 : YIELD_EVERY_LINES),
        );
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

/**
 * One chunk's answer written and counted. Its report rows go through the hook first, in order; a
 * row the hook refuses is written as its error row in place of its text.
 */
async function writeAnswer(
  a: ChunkAnswer,
  o: StreamBatchOptions,
  line: (r: BatchOutputLine) => string,
  counts: BatchCounts,
): Promise<void> {
  counts.lines += a.lines;
  counts.ok += a.ok;
  counts.failed += a.failed;
  counts.blank += a.blank;
  let from = 0;
  const rows: readonly ReportRow[] = o.reports === undefined ? [] : (a.reportRows ?? []);
  for (const r of rows) {
    const refused = await o.reports?.onRow(r.row, r.procedure);
    if (refused === undefined) continue;
    if (r.at > from) await o.write(a.bytes.subarray(from, r.at));
    await o.write(line({ id: r.row.id, line: r.row.line, ok: false, error: refused }));
    from = r.end;
    counts.ok -= 1;
    counts.failed += 1;
  }
  if (a.bytes.length > from) await o.write(from === 0 ? a.bytes : a.bytes.subarray(from));
}
