import { createInterface } from "node:readline";
import { Readable } from "node:stream";
import type { Context } from "../../api/context.js";
import { procedureEntry, procedureInvoker } from "../../api/procedure-registry.js";
import type { Shard } from "../../adapters/batch/answer.js";
import { type Format, outputFormatter } from "../../adapters/batch/formats.js";
import { processLine } from "../../adapters/batch/line.js";

/**
 * What the batch engine must write for a JSON Lines input, worked out the plain way: node:readline
 * for the lines (crlfDelay Infinity), blank lines skipped, each line of the shard through
 * processLine one at a time, written out with the output format (a CSV's columns: those of
 * `procedure`, else of `outputProcedures`, else of every procedure, as streamBatch), the texts joined and encoded once.
 */
export async function readlineOracle(
  bytes: Buffer,
  ctx: Context,
  o: { outFormat?: Format; procedure?: string; outputProcedures?: readonly string[]; shard?: Shard } = {},
): Promise<Buffer> {
  const invoker = procedureInvoker(ctx);
  const fmt = outputFormatter(o.outFormat ?? "jsonl", o.procedure === undefined ? o.outputProcedures : [o.procedure]);
  const texts: string[] = [fmt.header];
  let n = 0;
  for await (const raw of createInterface({ input: Readable.from([bytes]), crlfDelay: Number.POSITIVE_INFINITY })) {
    n += 1;
    if (o.shard !== undefined && (n - 1) % o.shard.count !== o.shard.index) continue;
    if (raw.trim() === "") continue;
    texts.push(fmt.line(await processLine(raw, n, invoker)));
  }
  return Buffer.from(texts.join(""), "utf8");
}

/** The procedures the lines name (the batch command's CSV columns without --procedure), the plain way: every line parsed. */
export function proceduresNamedPlainly(bytes: Buffer): string[] {
  const found = new Set<string>();
  for (const raw of bytes.toString("utf8").split(/\r?\n/)) {
    try {
      const p = (JSON.parse(raw) as { procedure?: unknown } | null)?.procedure;
      if (typeof p === "string" && procedureEntry(p) !== undefined) found.add(p);
    } catch {
      // not JSON: an error row
    }
  }
  return [...found];
}
