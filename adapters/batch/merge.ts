import { createReadStream } from "node:fs";
import { createInterface } from "node:readline";
import { parse } from "csv-parse";
import { stringify } from "csv-stringify/sync";
import type { Format } from "./formats.js";

interface Head {
  line: number;
  text: string;
}

/** Records of one shard output with their global line numbers, in file order. */
async function* shardRecords(file: string, format: Format, onHeader: (h: string) => void): AsyncGenerator<Head> {
  if (format === "jsonl") {
    for await (const text of createInterface({ input: createReadStream(file), crlfDelay: Number.POSITIVE_INFINITY })) {
      if (text === "") continue;
      const line = (JSON.parse(text) as { line?: unknown }).line;
      if (typeof line !== "number") throw new Error(`${file}: a line without its "line" number`);
      yield { line, text: `${text}\n` };
    }
    return;
  }
  let first = true;
  for await (const cells of createReadStream(file).pipe(parse({ relax_column_count: true })) as AsyncIterable<
    string[]
  >) {
    const text = stringify([cells]);
    if (first) {
      first = false;
      onHeader(text);
      continue;
    }
    const line = Number(cells[0]);
    if (!Number.isInteger(line)) throw new Error(`${file}: a row without its line number`);
    yield { line, text };
  }
}

/**
 * Merge shard outputs into the one output an unsharded run writes: a k-way merge on the global line
 * number, streaming (one record per shard in memory). CSV headers must agree; a line number twice
 * (a shard given twice, or the shards of two runs) or a line number missing (a shard left out) is an
 * error, so no merged file is written.
 */
export async function mergeShards(
  files: readonly string[],
  format: Format,
  write: (text: string) => Promise<void>,
): Promise<number> {
  let header: string | undefined;
  const onHeader = (h: string) => {
    if (header === undefined) header = h;
    else if (h !== header) throw new Error("the shard files have different CSV headers");
  };
  const its = files.map((f) => shardRecords(f, format, onHeader));
  const heads: (Head | undefined)[] = [];
  for (const it of its) heads.push((await it.next()).value ?? undefined);
  if (header !== undefined) await write(header);
  let n = 0;
  let last = 0;
  for (;;) {
    let best = -1;
    heads.forEach((h, i) => {
      if (h !== undefined && (best < 0 || h.line < (heads[best] as Head).line)) best = i;
    });
    if (best < 0) break;
    const h = heads[best] as Head;
    if (h.line <= last) throw new Error(`line ${h.line} appears twice or out of order across the shards`);
    // an unsharded run numbers every input record from 1, so the shards of one run hold every number once
    if (h.line !== last + 1)
      throw new Error(
        `line ${last + 1}${h.line > last + 2 ? ` to ${h.line - 1}` : ""} is in none of the shard files: give every shard of the run`,
      );
    last = h.line;
    await write(h.text);
    n += 1;
    heads[best] = (await (its[best] as AsyncGenerator<Head>).next()).value ?? undefined;
  }
  return n;
}
