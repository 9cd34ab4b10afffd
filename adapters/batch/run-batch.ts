import type { Readable, Writable } from "node:stream";
import type { Context } from "../../api/context.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import { streamBatch } from "./engine.js";
import type { BatchCounts } from "./line.js";

export { procedureInvoker };
export { type BatchCounts, type BatchOutputLine, batchLine, processLine } from "./line.js";

/** JSON Lines in → one result or error line out per input line, in order, same id: the batch engine in this thread, written to a stream. */
export async function runBatch(input: Readable, output: Writable, ctx: Context): Promise<BatchCounts> {
  return streamBatch({
    input,
    inFormat: "jsonl",
    outFormat: "jsonl",
    ctx,
    write: (chunk) =>
      output.write(chunk) ? Promise.resolve() : new Promise<void>((r) => output.once("drain", () => r())),
  });
}
