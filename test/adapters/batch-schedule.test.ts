import { Readable } from "node:stream";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { answerChunk, type ChunkAnswer, type ChunkTask } from "../../adapters/batch/answer.js";
import { streamBatch } from "../../adapters/batch/engine.js";
import { outputFormatter } from "../../adapters/batch/formats.js";
import { jsonlChunks } from "../../adapters/batch/jsonl-chunk.js";
import type { ComputePool } from "../../adapters/compute/pool.js";
import { procedureInvoker } from "../../api/procedure-registry.js";
import { demoContext } from "../helpers/app.js";
import { readlineOracle } from "../helpers/batch-oracle.js";

/**
 * How the batch engine hands out chunks: to the pool's threads once they are up, to the main
 * thread whenever it is free, written in input order whoever answers and however long each takes;
 * and how a chunk whose thread fails is answered row by row. The pool here is a stand-in in this
 * thread that answers with the same function as a worker thread after a delay of the test's
 * choosing. Oracle: readlineOracle (readline, one record at a time), as in batch-chunks.test.ts.
 */
const good = (a: number) => ({
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: a },
  ambientC: 25,
});

function inputBytes(n: number): Buffer {
  const lines: string[] = [];
  for (let i = 0; i < n; i += 1) {
    if (i % 17 === 3) lines.push("{ not json");
    else if (i % 23 === 5)
      lines.push(JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: { ...good(1), supplyV: "-3 V" } }));
    else lines.push(JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: good((i % 40) / 10) }));
  }
  return Buffer.from(`${lines.join("\n")}\n`);
}

function piecesOf(bytes: Buffer, step: number): Readable {
  const chunks: Buffer[] = [];
  for (let at = 0; at < bytes.length; at += step) chunks.push(bytes.subarray(at, at + step));
  return Readable.from(chunks);
}

const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/** A pool of `threads` stand-in threads: each task answered after `delayMs(k)` (k: the task's number), ready after `readyMs`. */
function standInPool(
  threads: number,
  readyMs: number,
  delayMs: (k: number) => number,
  fault?: (text: string, lines: number) => boolean,
) {
  const invoker = procedureInvoker(demoContext());
  const line = outputFormatter("jsonl", undefined).line;
  let tasks = 0;
  let busy = 0;
  let mostBusy = 0;
  const ready = sleep(readyMs);
  const pool: ComputePool = {
    threads,
    call: () => Promise.reject(new Error("not used")),
    callJson: () => Promise.reject(new Error("not used")),
    report: () => Promise.reject(new Error("not used")),
    ready: () => ready,
    batchChunk: async (c: ChunkTask): Promise<ChunkAnswer> => {
      const k = tasks;
      tasks += 1;
      busy += 1;
      mostBusy = Math.max(mostBusy, busy);
      await sleep(delayMs(k));
      const text = Buffer.from(c.bytes.buffer, c.bytes.byteOffset, c.bytes.byteLength).toString("utf8");
      if (fault?.(text, c.lines) === true) {
        busy -= 1;
        throw new Error("stand-in thread failed");
      }
      const a = await answerChunk(c, line, invoker);
      busy -= 1;
      return a;
    },
    close: () => Promise.resolve(),
  };
  return { pool, stats: () => ({ tasks, mostBusy }) };
}

const oracleOf = (bytes: Buffer): Promise<Buffer> => readlineOracle(bytes, demoContext());

async function chunked(
  bytes: Buffer,
  pool: ComputePool | undefined,
  opts: { piece: number; chunkBytes: number; writeMs?: (k: number) => number; poolOnly?: boolean },
) {
  const parts: Buffer[] = [];
  let writes = 0;
  const counts = await streamBatch({
    input: piecesOf(bytes, opts.piece),
    inFormat: "jsonl",
    outFormat: "jsonl",
    ctx: demoContext(),
    pool,
    chunkBytes: opts.chunkBytes,
    poolOnly: opts.poolOnly,
    write: async (c) => {
      const k = writes;
      writes += 1;
      const ms = opts.writeMs?.(k) ?? 0;
      if (ms > 0) await sleep(ms);
      parts.push(typeof c === "string" ? Buffer.from(c, "utf8") : Buffer.from(c));
    },
  });
  return { bytes: Buffer.concat(parts), counts };
}

describe("chunks handed out as they are taken", () => {
  const bytes = inputBytes(600);
  const oracle = oracleOf(bytes);

  it("written in input order whatever the pool's and the writer's delays, the thread count and the pool's start (property, fast-check)", async () => {
    const want = await oracle;
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 1, max: 3 }),
        fc.integer({ min: 0, max: 30 }),
        fc.array(fc.integer({ min: 0, max: 12 }), { minLength: 1, maxLength: 20 }),
        fc.array(fc.integer({ min: 0, max: 6 }), { minLength: 1, maxLength: 8 }),
        fc.integer({ min: 1_000, max: 40_000 }),
        fc.integer({ min: 512, max: 65_536 }),
        async (threads, readyMs, delays, writeDelays, chunkBytes, piece) => {
          const { pool } = standInPool(threads, readyMs, (k) => delays[k % delays.length] as number);
          const got = await chunked(bytes, pool, {
            piece,
            chunkBytes,
            writeMs: (k) => writeDelays[k % writeDelays.length] as number,
          });
          expect(got.bytes.equals(want)).toBe(true);
          expect(got.counts.lines).toBe(600);
        },
      ),
      { numRuns: 25 },
    );
  }, 120_000);

  it("the main thread answers while the pool starts and the pool answers once it is up; no thread is given more than one chunk at a time", async () => {
    const big = inputBytes(5000);
    const { pool, stats } = standInPool(1, 20, () => 5);
    const got = await chunked(big, pool, { piece: 4096, chunkBytes: 2000 });
    expect(got.bytes.equals(await oracleOf(big))).toBe(true);
    const s = stats();
    let chunks = 0;
    for await (const _ of jsonlChunks(piecesOf(big, 4096), 2000)) chunks += 1;
    expect(s.tasks).toBeGreaterThan(0); // the pool took some
    expect(s.tasks).toBeLessThan(chunks); // and the main thread the rest (at least those before the pool was up)
    expect(s.mostBusy).toBeLessThanOrEqual(1);
  });

  it("poolOnly: every chunk in the pool", async () => {
    const { pool, stats } = standInPool(2, 10, () => 1);
    const got = await chunked(bytes, pool, { piece: 4096, chunkBytes: 2000, poolOnly: true });
    expect(got.bytes.equals(await oracle)).toBe(true);
    let chunks = 0;
    for await (const _ of jsonlChunks(piecesOf(bytes, 4096), 2000)) chunks += 1;
    expect(chunks).toBeGreaterThan(10);
    expect(stats().tasks).toBe(chunks);
  });

  it("a failed write or a failed read ends the run with that error (nothing hangs)", async () => {
    const { pool } = standInPool(1, 0, () => 2);
    const failingWrite = streamBatch({
      input: piecesOf(bytes, 4096),
      inFormat: "jsonl",
      outFormat: "jsonl",
      ctx: demoContext(),
      pool,
      chunkBytes: 2000,
      write: async () => {
        await sleep(1);
        throw new Error("disk full");
      },
    });
    await expect(failingWrite).rejects.toThrow("disk full");
    const broken = new Readable({ read() {} });
    broken.push(bytes.subarray(0, 5000));
    setTimeout(() => broken.destroy(new Error("input went away")), 20);
    await expect(
      streamBatch({
        input: broken,
        inFormat: "jsonl",
        outFormat: "jsonl",
        ctx: demoContext(),
        pool,
        chunkBytes: 2000,
        write: () => Promise.resolve(),
      }),
    ).rejects.toThrow("input went away");
  });

  it("a chunk whose thread fails is answered row by row: a row that fails again is an internal error row, every other row as without the fault", async () => {
    const lines = inputBytes(300).toString("utf8").split("\n");
    lines[40] = JSON.stringify({ id: "lost", procedure: "operatingPoint", input: good(1) });
    lines[41] = ""; // a blank line in a failed chunk stays blank
    const bytes = Buffer.from(lines.join("\n"));
    // a chunk of several lines fails when it holds row 41; row 41 alone fails again
    const { pool } = standInPool(
      2,
      0,
      () => 0,
      (text, n) => text.includes('"lost"') || (n > 1 && text.includes('"r7"')),
    );
    const got = await chunked(bytes, pool, { piece: 4096, chunkBytes: 3000, poolOnly: true });
    const want = (await oracleOf(bytes)).toString("utf8").split("\n");
    const rows = got.bytes.toString("utf8").split("\n");
    expect(rows).toHaveLength(want.length);
    const lost = rows
      .map((r, i) => [r, i] as const)
      .filter(([r]) => r !== "" && !(JSON.parse(r) as { ok: boolean }).ok && r.includes('"internal"'));
    expect(
      lost
        .map(([r]) => JSON.parse(r) as { id: unknown; line: number; error: { message: string } })
        .map((r) => [r.id, r.line, r.error.message]),
    ).toEqual([["lost", 41, "the worker thread failed on this record: stand-in thread failed"]]);
    for (const [i, r] of rows.entries()) if (i !== lost[0]?.[1]) expect(r).toBe(want[i]);
    expect(got.counts.blank).toBe(1);
    expect(got.counts.lines).toBe(299);
  });
});
