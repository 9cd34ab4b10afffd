import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import { Readable } from "node:stream";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cutAfter, jsonlChunks, lineCountOf, linesOf, MAX_LINE_BYTES } from "../../adapters/batch/jsonl-chunk.js";
import { type StreamBatchOptions, streamBatch } from "../../adapters/batch/engine.js";
import { demoContext } from "../helpers/app.js";
import { builtCli } from "../helpers/build-once.js";
import { proceduresNamedPlainly, readlineOracle } from "../helpers/batch-oracle.js";

/**
 * The batch engine (input cut into chunks of whole lines as bytes, answered in worker threads or
 * in process) writes what a plain reading writes. Oracles: node:readline for the line breaks, and
 * readlineOracle (readline, one record at a time, the output format's line) for the output.
 */
const good = (a: number) => ({
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: a },
  ambientC: 25,
});

/** Valid rows, invalid rows, malformed JSON, unknown procedures, blank lines, CRLF and lone CR breaks, non-ASCII text, a bad UTF-8 byte. */
function mixedBytes(n: number): Buffer {
  const parts: Buffer[] = [];
  for (let i = 0; i < n; i += 1) {
    const k = i % 11;
    let text: string;
    if (k === 1) text = "{ not json";
    else if (k === 2)
      text = JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: { ...good(1), supplyV: "12 A" } });
    else if (k === 3) text = JSON.stringify({ id: i, procedure: "noSuchProcedure", input: {} });
    else if (k === 4) text = "";
    else if (k === 5)
      text = JSON.stringify({
        id: `µΩ-𝄞-${i}`,
        procedure: "operatingPoint",
        input: { ...good(1), stage: { kind: "catalog-part", partId: "missing °C" } },
      });
    else if (k === 6) text = "   ";
    else if (k === 7) text = JSON.stringify([1, 2]);
    else text = JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: good((i % 40) / 10) });
    parts.push(Buffer.from(text, "utf8"));
    if (i % 97 === 50) parts.push(Buffer.from([0xc3])); // a truncated two-byte sequence before the break
    parts.push(Buffer.from(i % 13 === 0 ? "\r\n" : i % 29 === 0 ? "\r" : "\n"));
  }
  return Buffer.concat(parts);
}

async function readlineLines(bytes: Buffer, pieces: number): Promise<string[]> {
  const step = Math.max(1, Math.ceil(bytes.length / pieces));
  const chunks: Buffer[] = [];
  for (let at = 0; at < bytes.length; at += step) chunks.push(bytes.subarray(at, at + step));
  const out: string[] = [];
  for await (const l of createInterface({ input: Readable.from(chunks), crlfDelay: Number.POSITIVE_INFINITY }))
    out.push(l);
  return out;
}

function piecesOf(bytes: Buffer, step: number): Readable {
  const chunks: Buffer[] = [];
  for (let at = 0; at < bytes.length; at += step) chunks.push(bytes.subarray(at, at + step));
  return Readable.from(chunks);
}

describe("JSON Lines chunks break lines as readline does", () => {
  const cases = [
    "",
    "\n",
    "a",
    "a\n",
    "a\r",
    "a\r\n",
    "a\n\n",
    "\r\r\n\n",
    "a\rb\r\nc\nd",
    "a\r\r",
    "é\n€\r𝄞",
    "\n\n\nx",
  ];
  it.each(cases.map((c) => [JSON.stringify(c), c]))("%s", async (_name, text) => {
    const want = await readlineLines(Buffer.from(text as string), 1);
    expect(linesOf(text as string)).toEqual(want);
    expect(lineCountOf(Buffer.from(text as string))).toBe(want.length);
  });

  it("a mixed file cut into chunks of every size: the same lines, numbered without a gap", async () => {
    const bytes = mixedBytes(600);
    const want = await readlineLines(bytes, 37);
    for (const [piece, target] of [
      [1000, 1],
      [64 * 1024, 4096],
      [333, 2000],
      [7, 10_000],
      [1024 * 1024, 3000], // one piece, many chunks
    ] as const) {
      const got: string[] = [];
      let next = 1;
      for await (const c of jsonlChunks(piecesOf(bytes, piece), target)) {
        expect(c.firstLine).toBe(next);
        const lines = linesOf(Buffer.from(c.bytes).toString("utf8"));
        expect(lines).toHaveLength(c.lines);
        got.push(...lines);
        next += c.lines;
      }
      expect(got).toEqual(want);
    }
  });
});

describe("where a chunk is cut", () => {
  // Oracle: readline's breaks (\r\n, \n, or a lone \r); a cut is never inside a \r\n and never before the wanted size.
  it.each([
    ["ab\ncd\n", 0, 3],
    ["ab\ncd\n", 3, 6],
    ["ab\r\ncd", 0, 4],
    ["ab\rcd", 0, 3],
    ["ab\r", 0, -1], // the next byte decides between \r and \r\n
    ["ab\r\n", 2, 4],
    ["ab\r\n", 3, 4],
    ["abcd", 0, -1],
    ["a\rb\nc", 2, 4],
  ] as const)("%j from %i -> %i", (text, from, want) => {
    expect(cutAfter(Buffer.from(text), from)).toBe(want);
  });

  it("a line longer than many pieces (but not than MAX_LINE_BYTES) comes whole in one chunk, the lines around it in chunks of their own", async () => {
    const long = `{"id":"long","pad":"${"x".repeat(2_000_000)}"}`; // under MAX_LINE_BYTES
    const text = `a\nb\r\n${long}\r\nc\nd\n`;
    const got: string[] = [];
    let next = 1;
    for await (const c of jsonlChunks(piecesOf(Buffer.from(text), 64 * 1024), 2)) {
      expect(c.firstLine).toBe(next);
      const lines = linesOf(Buffer.from(c.bytes).toString("utf8"));
      expect(lines).toHaveLength(c.lines);
      next += c.lines;
      got.push(...lines);
    }
    expect(got).toEqual(["a", "b", long, "c", "d"]);
  });

  it("lines over the byte cap come as chunks of their own without bytes; every other line as readline reads it (property, fast-check)", async () => {
    // Oracle: node:readline's lines; a line whose bytes (break not counted) exceed the cap is
    // expected as one overlong chunk whose size counts its break.
    const content = fc
      .array(fc.constantFrom("a", "b", " ", "{", "é", "€", "𝄞"), { maxLength: 120 })
      .map((cs) => cs.join(""));
    const brk = fc.constantFrom("\n", "\r\n", "\r");
    const input = fc.record({
      lines: fc.array(fc.tuple(content, brk), { maxLength: 40 }),
      last: fc.option(content, { nil: undefined }),
      piece: fc.integer({ min: 1, max: 400 }),
      target: fc.integer({ min: 1, max: 200 }),
      extraCap: fc.integer({ min: 0, max: 150 }),
    });
    await fc.assert(
      fc.asyncProperty(input, async ({ lines, last, piece, target, extraCap }) => {
        const text = lines.map(([c, b]) => c + b).join("") + (last ?? "");
        if (text === "") return;
        const bytes = Buffer.from(text, "utf8");
        const cap = target + extraCap;
        // each line's break as the text has it (a generated "\r" then "\n" reads as one \r\n)
        let at = 0;
        const want = (await readlineLines(bytes, 1)).map((l) => {
          at += l.length;
          const b = text.startsWith("\r\n", at) ? 2 : text[at] === "\r" || text[at] === "\n" ? 1 : 0;
          at += b;
          const n = Buffer.byteLength(l, "utf8");
          return n > cap ? { overlong: n + b } : { line: l };
        });
        const got: ({ overlong: number } | { line: string })[] = [];
        let next = 1;
        for await (const c of jsonlChunks(piecesOf(bytes, piece), target, cap)) {
          expect(c.firstLine).toBe(next);
          next += c.lines;
          if (c.overlongBytes !== undefined) {
            expect([c.lines, c.bytes.length]).toEqual([1, 0]);
            got.push({ overlong: c.overlongBytes });
          } else {
            const ls = linesOf(Buffer.from(c.bytes).toString("utf8"));
            expect(ls).toHaveLength(c.lines);
            for (const l of ls) got.push({ line: l });
          }
        }
        expect(got).toEqual(want);
      }),
      { numRuns: 400, seed: 20261202 },
    );
  });

  it("a line past MAX_LINE_BYTES is answered as too long without being held; the lines around it as readline reads them", async () => {
    const around = (i: number) => JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: good(1) });
    const huge = `{"id":"huge","pad":"${"x".repeat(MAX_LINE_BYTES + 10)}"}`;
    const text = `${around(1)}\n${huge}\r\n${around(2)}\n${huge}`;
    const oracle = await readlineOracle(Buffer.from(text), demoContext());
    const chunked = await collect((write) =>
      streamBatch({
        input: piecesOf(Buffer.from(text), 1024 * 1024),
        inFormat: "jsonl",
        outFormat: "jsonl",
        write,
        ctx: demoContext(),
      }),
    );
    expect(chunked.toString("utf8")).toBe(oracle.toString("utf8"));
    const records = chunked
      .toString("utf8")
      .trim()
      .split("\n")
      .map((l) => JSON.parse(l) as { line: number; ok: boolean; error?: { message: string } });
    expect(records.map((r) => [r.line, r.ok])).toEqual([
      [1, true],
      [2, false],
      [3, true],
      [4, false],
    ]);
    expect(records[1]?.error?.message).toBe("line longer than 1000000 characters");
  });

  it("chunks stay near the target size with any kind of break (lone \r breaks too: no chunk holds the whole input)", async () => {
    const lines = Array.from({ length: 3000 }, (_, i) =>
      JSON.stringify({ id: i, procedure: "operatingPoint", input: good(i / 1000) }),
    );
    const longest = Math.max(...lines.map((l) => l.length));
    for (const eol of ["\n", "\r\n", "\r"]) {
      const bytes = Buffer.from(lines.join(eol) + eol);
      const target = 20_000;
      const sizes: number[] = [];
      let next = 1;
      for await (const c of jsonlChunks(piecesOf(bytes, 64 * 1024), target)) {
        expect(c.firstLine).toBe(next);
        next += c.lines;
        sizes.push(c.bytes.length);
      }
      expect(next - 1).toBe(lines.length);
      expect(sizes.length).toBeGreaterThan(bytes.length / (target + longest + 2) - 1);
      for (const size of sizes.slice(0, -1)) {
        expect(size).toBeGreaterThanOrEqual(target);
        expect(size).toBeLessThanOrEqual(target + longest + 2);
      }
    }
  });
});

async function collect(run: (write: (c: string | Uint8Array) => Promise<void>) => Promise<unknown>): Promise<Buffer> {
  const parts: Buffer[] = [];
  await run(async (c) => {
    parts.push(typeof c === "string" ? Buffer.from(c, "utf8") : Buffer.from(c));
  });
  return Buffer.concat(parts);
}

describe("in process: the engine writes what readline and processLine write", () => {
  const bytes = mixedBytes(900);
  const base = (extra: Partial<StreamBatchOptions>) => (write: (c: string | Uint8Array) => Promise<void>) =>
    streamBatch({
      input: piecesOf(bytes, 4000),
      inFormat: "jsonl",
      outFormat: "jsonl",
      write,
      ctx: demoContext(),
      ...extra,
    });

  it("JSON Lines out, chunks of any size", async () => {
    const oracle = await readlineOracle(bytes, demoContext());
    // one record per line that is not blank (blank lines are skipped and counted apart)
    expect(oracle.toString("utf8").split("\n")).toHaveLength(
      await readlineLines(bytes, 1).then((l) => l.filter((x) => x.trim() !== "").length + 1),
    );
    for (const chunkBytes of [1, 3000, 256 * 1024])
      expect((await collect(base({ chunkBytes }))).equals(oracle)).toBe(true);
  });

  it("CSV out and a shard", async () => {
    for (const extra of [
      { outFormat: "csv" as const },
      { shard: { index: 1, count: 3 } },
      { outFormat: "csv" as const, procedure: "operatingPoint", shard: { index: 0, count: 2 } },
    ]) {
      const chunked = await collect(base({ ...extra, chunkBytes: 5000 }));
      expect(chunked.length).toBeGreaterThan(1000);
      expect(chunked.equals(await readlineOracle(bytes, demoContext(), extra))).toBe(true);
    }
  });
});

describe("built CLI: in process, one worker thread and two write the same bytes", () => {
  const bin = builtCli();
  const dir = mkdtempSync(join(tmpdir(), "backstop-chunks-"));
  const run = (args: string[]) =>
    spawnSync("node", [bin, "batch", ...args], {
      encoding: "utf8",
      env: { ...process.env, BACKSTOP_PROGRESS_MS: "600000" },
    });
  // about 1.2 MB: several chunks of the default size, so the threads and the main thread each answer some
  const input = join(dir, "mixed.jsonl");
  writeFileSync(input, mixedBytes(6000));

  it.each(["jsonl", "csv"])(
    "JSON Lines in, %s out, against readline and processLine",
    async (fmt) => {
      const outs = ["0", "1", "2"].map((w) => {
        const out = join(dir, `out-w${w}.${fmt}`);
        const r = run(["--in", input, "--out", out, "--workers", w]);
        expect(r.status, r.stderr).toBe(1); // some rows rejected
        return readFileSync(out);
      });
      // the command reads the whole input first for the procedures it names (a CSV output's columns)
      const oracle = await readlineOracle(readFileSync(input), demoContext(), {
        outFormat: fmt as "jsonl" | "csv",
        outputProcedures: proceduresNamedPlainly(readFileSync(input)),
      });
      for (const o of outs) expect(o.equals(oracle)).toBe(true);
    },
    120_000,
  );

  it("CSV in: in process and two threads agree", () => {
    const csv = join(dir, "in.csv");
    const rows = ["id,procedure,stage.kind,stage.partId,supplyV,load.kind,load.currentA,ambientC"];
    for (let i = 0; i < 500; i += 1)
      rows.push(
        i % 9 === 4
          ? `c${i},operatingPoint,catalog-part,missing,12 A,constant-current,1,25`
          : i % 9 === 7
            ? `c${i},nope,,,,,,`
            : `c${i},operatingPoint,catalog-part,demo-schottky-5a-45v,12,constant-current,${(i % 30) / 10},25`,
      );
    writeFileSync(csv, `${rows.join("\n")}\n`);
    const outs = ["0", "2"].map((w) => {
      const out = join(dir, `csv-w${w}.jsonl`);
      expect(run(["--in", csv, "--out", out, "--workers", w]).status).toBe(1);
      return readFileSync(out);
    });
    expect(outs[0]?.length).toBeGreaterThan(1000);
    expect(outs[0]?.equals(outs[1] as Buffer)).toBe(true);
  }, 60_000);
});
