import { createInterface } from "node:readline";
import { Readable } from "node:stream";
import type { Context } from "../../api/context.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import type { Shard } from "../../adapters/batch/answer.js";
import { type Format, outputFormatter } from "../../adapters/batch/formats.js";
import { processLine } from "../../adapters/batch/line.js";

/**
 * What the batch engine must write for a JSON Lines input, worked out the plain way: node:readline
 * for the lines (crlfDelay Infinity), blank lines skipped, each line of the shard through
 * processLine one at a time, written out with the output format, the texts joined and encoded once.
 */
export async function readlineOracle(
  bytes: Buffer,
  ctx: Context,
  o: { outFormat?: Format; procedure?: string; shard?: Shard } = {},
): Promise<Buffer> {
  const invoker = procedureInvoker(ctx);
  const fmt = outputFormatter(o.outFormat ?? "jsonl", o.procedure);
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
