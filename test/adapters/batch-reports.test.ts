import { readFileSync } from "node:fs";
import { join } from "node:path";
import { Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { type RowHook, streamBatch } from "../../adapters/batch/engine.js";
import { MAX_LINE_BYTES } from "../../adapters/batch/jsonl-chunk.js";
import { projectRoot } from "../../adapters/project-root.js";
import { demoContext } from "../helpers/app.js";
import { readlineOracle } from "../helpers/batch-oracle.js";

/**
 * Reports in the one engine (`--report-dir`): a line of a report procedure is asked for its chart
 * data where it does not say, its answered row reaches the hook in input order, and a row the hook
 * refuses (a report that could not be drawn) is written as that line's error row while the rest
 * go on. Oracle: readlineOracle over the same lines with the flag written in by hand.
 */
const example = (name: string) =>
  JSON.parse(readFileSync(join(projectRoot(), "examples", "requests", `${name}.json`), "utf8")) as {
    procedure: string;
    input: Record<string, unknown>;
  };
const review = example("review");
const bridge = example("bridgeAc");
const good = {
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: 1 },
  ambientC: 25,
};
const huge = `{"id":"huge","pad":"${"x".repeat(MAX_LINE_BYTES + 10)}"}`;
const flags = { review: "curves", bridgeAc: "waveform" };

function lines(flagged: boolean): string[] {
  return [
    JSON.stringify({
      id: "rv-a",
      procedure: "review",
      input: flagged ? { ...review.input, curves: true } : review.input,
    }),
    huge,
    JSON.stringify({ id: "rv-b", procedure: "review", input: { ...review.input, curves: false } }),
    "{ not json",
    JSON.stringify({ id: "op", procedure: "operatingPoint", input: good }),
    JSON.stringify({
      id: "br",
      procedure: "bridgeAc",
      input: flagged ? { ...bridge.input, waveform: true } : bridge.input,
    }),
    JSON.stringify({ id: "rv-c", procedure: "review", input: { ...review.input, candidates: [] } }),
  ];
}

async function run(text: string, onRow: RowHook, chunkBytes: number) {
  const parts: Buffer[] = [];
  const counts = await streamBatch({
    input: Readable.from([Buffer.from(text)]),
    inFormat: "jsonl",
    outFormat: "jsonl",
    write: async (c) => void parts.push(Buffer.from(c)),
    ctx: demoContext(),
    reports: { flags, onRow },
    chunkBytes,
  });
  return { out: Buffer.concat(parts).toString("utf8"), counts };
}

describe("batch reports: flags, the hook in input order, refused rows", () => {
  it.each([1, 64 * 1024])("chunks of %i bytes", async (chunkBytes) => {
    const seen: [number, string, boolean][] = [];
    const onRow: RowHook = (row, procedure) => {
      // the chart data in the result: a review candidate's curves, a bridgeAc's waveform
      seen.push([
        row.line,
        procedure,
        JSON.stringify(row.result).includes(procedure === "review" ? '"curves":{' : '"waveform":{'),
      ]);
      return row.line === 1 ? { code: "report-failed", message: "cannot draw", issues: [] } : undefined;
    };
    const got = await run(lines(false).join("\n"), onRow, chunkBytes);
    // rows 1 (flag set here), 3 (its own curves: false kept) and 6; row 7 is refused by the contract, never drawn
    expect(seen).toEqual([
      [1, "review", true],
      [3, "review", false],
      [6, "bridgeAc", true],
    ]);
    const want = (await readlineOracle(Buffer.from(lines(true).join("\n")), demoContext()))
      .toString("utf8")
      .split("\n");
    const rows = got.out.split("\n");
    expect(rows).toHaveLength(want.length);
    expect(JSON.parse(rows[0] as string)).toEqual({
      id: "rv-a",
      line: 1,
      ok: false,
      error: { code: "report-failed", message: "cannot draw", issues: [] },
    });
    for (let i = 1; i < rows.length; i += 1) expect(rows[i]).toBe(want[i]);
    expect(got.counts).toEqual({ lines: 7, ok: 3, failed: 4, blank: 0 });
  });
});
