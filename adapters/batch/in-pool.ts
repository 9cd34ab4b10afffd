import type { ComputePool } from "../compute/pool.js";
import { type ChunkAnswer, type ChunkOptions, inShard, type RecordChunk, type ReportRow } from "./answer.js";
import { linesOf } from "./jsonl-chunk.js";
import { type BatchOutputLine, idOfRaw, isBlankLine } from "./line.js";

/**
 * A chunk answered in the pool. If its task fails (the worker thread threw or died), each of its
 * rows is asked again alone, so only a row that fails again is answered, as an internal error,
 * and the run goes on. This is the batch's one retry.
 */
export async function answerInPool(
  pool: ComputePool,
  c: RecordChunk,
  o: ChunkOptions,
  line: (r: BatchOutputLine) => string,
): Promise<ChunkAnswer> {
  try {
    // a copy in a buffer of its own, transferred to the thread (c.bytes stays here for the retry)
    return await pool.batchChunk({ ...o, ...c, bytes: new Uint8Array(c.bytes) });
  } catch {
    const parts: ChunkAnswer[] = [];
    for (const row of rowsOf(c, o)) {
      try {
        parts.push(await pool.batchChunk({ ...o, ...row.chunk }));
      } catch (e) {
        parts.push(lostRow(row, e, line));
      }
    }
    return joined(parts);
  }
}

interface OneRow {
  readonly chunk: RecordChunk;
  readonly raw: string;
}

/** The chunk's rows in the shard, each as a chunk of its own (its bytes in a buffer of their own). */
function* rowsOf(c: RecordChunk, o: ChunkOptions): Generator<OneRow> {
  const raws = linesOf(Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength).toString("utf8"));
  for (let i = 0; i < c.lines; i += 1) {
    const lineNo = c.firstLine + i;
    if (!inShard(lineNo, o.shard)) continue;
    const raw = raws[i] ?? "";
    const answered = c.answered?.filter((r) => r.line === lineNo);
    const bytes = new Uint8Array(Buffer.from(raw, "utf8"));
    yield {
      raw,
      chunk: {
        bytes,
        firstLine: lineNo,
        lines: 1,
        ...(answered !== undefined && answered.length > 0 ? { answered } : {}),
      },
    };
  }
}

/** The answer for a row whose thread failed twice: an internal error row (a row the reader answered keeps its answer; a blank line stays blank). */
function lostRow(r: OneRow, e: unknown, line: (o: BatchOutputLine) => string): ChunkAnswer {
  const known = r.chunk.answered?.[0];
  if (known === undefined && isBlankLine(r.raw))
    return { bytes: new Uint8Array(0), lines: 0, ok: 0, failed: 0, blank: 1 };
  const message = `the worker thread failed on this record: ${(e as Error).message}`.slice(0, 500);
  const row: BatchOutputLine = known ?? {
    id: idOfRaw(r.raw),
    line: r.chunk.firstLine,
    ok: false,
    error: { code: "internal", message, issues: [] },
  };
  return { bytes: Buffer.from(line(row), "utf8"), lines: 1, ok: row.ok ? 1 : 0, failed: row.ok ? 0 : 1, blank: 0 };
}

/** Answers of consecutive rows as one (report rows' places shifted into the joined bytes). */
function joined(parts: readonly ChunkAnswer[]): ChunkAnswer {
  const reportRows: ReportRow[] = [];
  let at = 0;
  for (const p of parts) {
    for (const r of p.reportRows ?? []) reportRows.push({ ...r, at: r.at + at, end: r.end + at });
    at += p.bytes.length;
  }
  const sum = (k: "lines" | "ok" | "failed" | "blank") => parts.reduce((n, p) => n + p[k], 0);
  return {
    bytes: Buffer.concat(parts.map((p) => p.bytes)),
    lines: sum("lines"),
    ok: sum("ok"),
    failed: sum("failed"),
    blank: sum("blank"),
    ...(reportRows.length > 0 ? { reportRows } : {}),
  };
}
