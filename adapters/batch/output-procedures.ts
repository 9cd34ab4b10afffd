import { createReadStream } from "node:fs";
import { procedureEntry } from "../../api/procedure-registry.js";
import type { Format } from "./formats.js";
import { linesOf } from "./jsonl-chunk.js";
import { recordChunks } from "./reader.js";

/**
 * The procedures the lines of an input file name, each once: a CSV
 * output without --procedure holds their result columns (formats.ts `resultColumns`), and the
 * header is written before the first row, so the file is read once before the run, through the
 * batch's own reader (a CSV row as the JSON line it makes), the whole file whatever the shard (so
 * every shard's header is the unsharded run's, and the shards merge). A line that does not parse
 * or names no known procedure adds none (it is an error row, without result columns).
 */
export async function proceduresNamedIn(path: string, format: Format): Promise<string[]> {
  const found = new Set<string>();
  for await (const c of recordChunks(createReadStream(path), format, { targetBytes: 1 << 20 })) {
    const bytes = Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength);
    for (const raw of linesOf(bytes.toString("utf8"))) {
      if (raw === "") continue;
      let procedure: unknown;
      try {
        procedure = (JSON.parse(raw) as { procedure?: unknown } | null)?.procedure;
      } catch {
        continue;
      }
      if (typeof procedure === "string" && procedureEntry(procedure) !== undefined) found.add(procedure);
    }
  }
  return [...found];
}
