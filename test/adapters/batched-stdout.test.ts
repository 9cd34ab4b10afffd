import { Writable } from "node:stream";
import { describe, expect, it } from "vitest";
import { batchedStdout, LOG_FLUSH_MS } from "../../adapters/logging/batched-stdout.js";

function sink() {
  const writes: string[] = [];
  const out = new Writable({
    write(c, _e, done) {
      writes.push(String(c));
      done();
    },
  });
  return { out, writes };
}

describe("batchedStdout", () => {
  it("writes the lines in order, together, within the flush interval", async () => {
    const { out, writes } = sink();
    const d = batchedStdout(out);
    for (let i = 0; i < 5; i += 1) d.write(`{"n":${i}}\n`);
    expect(writes).toEqual([]);
    await new Promise((r) => setTimeout(r, LOG_FLUSH_MS + 30));
    expect(writes).toEqual(['{"n":0}\n{"n":1}\n{"n":2}\n{"n":3}\n{"n":4}\n']);
  });
  it("writes at once past 64 KiB waiting, and on flush() before calling back", async () => {
    const { out, writes } = sink();
    const d = batchedStdout(out);
    const line = `${"x".repeat(1023)}\n`;
    for (let i = 0; i < 64; i += 1) d.write(line);
    expect(writes.length).toBe(1);
    expect(writes[0]?.length).toBe(64 * 1024);
    d.write("last\n");
    await new Promise<void>((r) => d.flush(() => r()));
    expect(writes).toEqual([line.repeat(64), "last\n"]);
  });
  it("stops writing, without failing, once the reader has gone (EPIPE)", async () => {
    const { out, writes } = sink();
    const d = batchedStdout(out);
    out.emit("error", Object.assign(new Error("write EPIPE"), { code: "EPIPE" }));
    d.write("lost\n");
    await new Promise<void>((r) => d.flush(() => r()));
    expect(writes).toEqual([]);
  });
});
