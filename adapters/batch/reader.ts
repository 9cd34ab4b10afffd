import type { Readable } from "node:stream";
import { parse } from "csv-parse";
import { inShard, type RecordChunk, type Shard } from "./answer.js";
import { csvHeaderProblem, csvRowToLine, type Format } from "./formats.js";
import { jsonlChunks } from "./jsonl-chunk.js";
import { type BatchOutputLine, overlongLine } from "./line.js";

/**
 * The batch's one reader: the input (JSON Lines or CSV) as chunks of whole records of at least
 * `targetBytes` each, numbered by their line in the input (a CSV row by its row after the header),
 * so shards and merges agree on them. Only the bytes are looked at for JSON Lines: decoding,
 * parsing and answering happen where the chunk is answered (answer.ts).
 */
export function recordChunks(
  input: Readable,
  format: Format,
  o: { targetBytes: number; procedure?: string | undefined; shard?: Shard | undefined },
): AsyncGenerator<RecordChunk> {
  return format === "csv"
    ? csvChunks(input, o.targetBytes, o.procedure, o.shard)
    : jsonlRecordChunks(input, o.targetBytes);
}

/** JSON Lines as cut by jsonlChunks; a line too long to hold comes as its own chunk, answered as too long. */
async function* jsonlRecordChunks(input: Readable, targetBytes: number): AsyncGenerator<RecordChunk> {
  for await (const c of jsonlChunks(input, targetBytes)) {
    yield c.overlongBytes === undefined
      ? c
      : { bytes: c.bytes, firstLine: c.firstLine, lines: 1, answered: [overlongLine(c.firstLine)] };
  }
}

/**
 * CSV rows, each as the JSON line it makes (csvRowToLine); a row that does not convert is answered
 * here with its error, a row outside the shard is not converted, and a blank row is an empty line
 * (skipped and counted where the chunk is answered). A header that cannot name a procedure fails
 * the run before any row.
 */
async function* csvChunks(
  input: Readable,
  targetBytes: number,
  procedure: string | undefined,
  shard: Shard | undefined,
): AsyncGenerator<RecordChunk> {
  const parser = input.pipe(parse({ bom: true, relax_column_count: true, skip_empty_lines: false }));
  let header: string[] | undefined;
  let n = 0;
  let texts: string[] = [];
  let answered: BatchOutputLine[] = [];
  let chars = 0;
  const cut = (): RecordChunk => {
    const c = {
      bytes: Buffer.from(`${texts.join("\n")}\n`, "utf8"),
      firstLine: n - texts.length + 1,
      lines: texts.length,
      ...(answered.length > 0 ? { answered } : {}),
    };
    texts = [];
    answered = [];
    chars = 0;
    return c;
  };
  for await (const cells of parser as AsyncIterable<string[]>) {
    if (header === undefined) {
      header = cells.map((h) => h.trim());
      const problem = csvHeaderProblem(header, procedure);
      if (problem !== undefined) throw new Error(problem);
      continue;
    }
    n += 1;
    let text = "";
    if (inShard(n, shard) && !cells.every((c) => c.trim() === "")) {
      const r = csvRowToLine(header, cells, procedure);
      if ("raw" in r) text = r.raw;
      else answered.push({ id: r.id, line: n, ok: false, error: r.error });
    }
    texts.push(text);
    chars += text.length + 1;
    if (chars >= targetBytes) yield cut();
  }
  if (texts.length > 0) yield cut();
}
