/** Bench baseline for batch: read JSON Lines, parse and re-serialise each line, write it (the I/O limit). */
import { createReadStream, createWriteStream } from "node:fs";
import { createInterface } from "node:readline";

const [inPath, outPath] = process.argv.slice(2);
if (!inPath || !outPath) throw new Error("usage: batch-passthrough IN OUT");
const out = createWriteStream(outPath);
let text = "";
for await (const line of createInterface({ input: createReadStream(inPath), crlfDelay: Number.POSITIVE_INFINITY })) {
  text += `${JSON.stringify(JSON.parse(line))}\n`;
  if (text.length > 65_536) {
    if (!out.write(text)) await new Promise<void>((r) => out.once("drain", () => r()));
    text = "";
  }
}
out.end(text);
await new Promise<void>((r) => out.once("finish", () => r()));
