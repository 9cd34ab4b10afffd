import type { Readable } from "node:stream";
import { parse } from "csv-parse";
import { resolveCurveFiles } from "../curves/curve-files.js";
import { inShard, type RecordChunk, type Shard } from "./answer.js";
import { csvPlaceText, csvRowCounter } from "./csv-rows.js";
import { csvHeaderProblem, csvRowToLine, type Format } from "./formats.js";
import { type JsonlChunk, jsonlChunks, linesOf } from "./jsonl-chunk.js";
import { type BatchOutputLine, overlongLine } from "./line.js";

/**
 * The batch's one reader: the input (JSON Lines or CSV) as chunks of whole records of at least
 * `targetBytes` each, numbered by their line in the input (a CSV row by its row after the header, csv-rows.ts),
 * so shards and merges agree on them. Only the bytes are looked at for JSON Lines: decoding,
 * parsing and answering happen where the chunk is answered (answer.ts); but with `curveFolder`
 * (the input file's folder), a line that may reference a curve file (its bytes hold `"csv"`) is
 * parsed here and the files' points put in (withCurveFiles).
 */
export function recordChunks(
  input: Readable,
  format: Format,
  o: {
    targetBytes: number;
    procedure?: string | undefined;
    shard?: Shard | undefined;
    curveFolder?: string | undefined;
  },
): AsyncGenerator<RecordChunk> {
  return format === "csv"
    ? csvChunks(input, o.targetBytes, o.procedure, o.shard, o.curveFolder)
    : jsonlRecordChunks(input, o.targetBytes, o.curveFolder, o.shard);
}

/** JSON Lines as cut by jsonlChunks; a line too long to hold comes as its own chunk, answered as too long. */
async function* jsonlRecordChunks(
  input: Readable,
  targetBytes: number,
  curveFolder: string | undefined,
  shard: Shard | undefined,
): AsyncGenerator<RecordChunk> {
  for await (const c of jsonlChunks(input, targetBytes)) {
    if (c.overlongBytes !== undefined)
      yield { bytes: c.bytes, firstLine: c.firstLine, lines: 1, answered: [overlongLine(c.firstLine)] };
    else yield curveFolder === undefined ? c : chunkWithCurveFiles(c, curveFolder, shard);
  }
}

const CSV_KEY = '"csv"';
// a line can reference a curve file only if its bytes hold the key's last four
const CSV_KEY_BYTES = Buffer.from('csv"', "utf8");

/** A chunk whose lines (in the shard) that reference curve files have them read in (or are answered with why not). */
function chunkWithCurveFiles(c: JsonlChunk, folder: string, shard: Shard | undefined): RecordChunk {
  const bytes = Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength);
  if (bytes.indexOf(CSV_KEY_BYTES) < 0) return c;
  const answered: BatchOutputLine[] = [];
  let changed = false;
  const lines = linesOf(bytes.toString("utf8")).map((raw, i) => {
    const r = inShard(c.firstLine + i, shard) ? withCurveFiles(raw, c.firstLine + i, folder) : undefined;
    if (r === undefined) return raw;
    changed = true;
    if ("text" in r) return r.text;
    answered.push(r.answered);
    return "";
  });
  if (!changed) return c;
  return {
    bytes: Buffer.from(`${lines.join("\n")}\n`, "utf8"),
    firstLine: c.firstLine,
    lines: c.lines,
    ...(answered.length > 0 ? { answered } : {}),
  };
}

/**
 * A batch line with its curve file references (curve-files.ts, relative to the input file's
 * folder, and only inside it) replaced by the files' points; its error row when a file cannot be
 * taken; undefined when it references none (or is not JSON: answered as such where it is answered).
 */
function withCurveFiles(
  raw: string,
  lineNo: number,
  folder: string,
): { text: string } | { answered: BatchOutputLine } | undefined {
  if (!raw.includes(CSV_KEY)) return undefined;
  let v: unknown;
  try {
    v = JSON.parse(raw);
  } catch {
    return undefined;
  }
  const r = resolveCurveFiles(v, { baseDir: folder, root: folder });
  if (r.ok) return r.files === 0 ? undefined : { text: JSON.stringify(r.value) };
  const id = typeof v === "object" && v !== null ? (v as { id?: unknown }).id : undefined;
  // paths as the procedure's errors give them: within the line's input
  const issues = r.problems.map((p) => ({
    path: p.path[0] === "input" ? p.path.slice(1) : p.path,
    message: p.message,
  }));
  return {
    answered: {
      id: typeof id === "string" || typeof id === "number" ? id : null,
      line: lineNo,
      ok: false,
      error: {
        code: r.problems.some((p) => p.limit) ? "limit-exceeded" : "invalid-input",
        message: r.problems[0]?.message ?? "",
        issues,
      },
    },
  };
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
  curveFolder: string | undefined,
): AsyncGenerator<RecordChunk> {
  const parser = input.pipe(parse({ bom: true, relax_column_count: true, skip_empty_lines: false, info: true }));
  const placeOf = csvRowCounter();
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
  for await (const { record: cells, info } of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
    const place = placeOf(info.lines);
    if (place === undefined || header === undefined) {
      header = cells.map((h) => h.trim());
      const problem = csvHeaderProblem(header, procedure);
      if (problem !== undefined) throw new Error(problem);
      continue;
    }
    n = place.row;
    // where the reader refuses a row it says which, as the catalog import does
    const at = (message: string) => `${csvPlaceText(place)}: ${message}`;
    let text = "";
    if (inShard(n, shard) && !cells.every((c) => c.trim() === "")) {
      const r = csvRowToLine(header, cells, procedure);
      const curves = "raw" in r && curveFolder !== undefined ? withCurveFiles(r.raw, n, curveFolder) : undefined;
      if (curves !== undefined && "answered" in curves) {
        const a = curves.answered;
        answered.push(a.ok ? a : { ...a, error: { ...a.error, message: at(a.error.message) } });
      } else if ("raw" in r) text = curves?.text ?? r.raw;
      else answered.push({ id: r.id, line: n, ok: false, error: { ...r.error, message: at(r.error.message) } });
    }
    texts.push(text);
    chars += text.length + 1;
    if (chars >= targetBytes) yield cut();
  }
  if (texts.length > 0) yield cut();
}
