import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { afterAll, describe, expect, it } from "vitest";
import { main } from "../../adapters/batch/cli.js";
import { BASE_COLUMNS, resultColumns } from "../../adapters/batch/formats.js";
import { projectRoot } from "../../adapters/project-root.js";

// A CSV output without --procedure: its header holds the result columns of the procedures the
// input names (issue #8: it held every procedure's, so a catalog.show line brought in no new
// field but the header still listed every procedure's). Runs the batch command in process.

const dir = mkdtempSync(join(tmpdir(), "backstop-csv-columns-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const example = (p: string) =>
  JSON.stringify(JSON.parse(readFileSync(join(projectRoot(), "examples/requests", `${p}.json`), "utf8")));

async function run(lines: string[], name: string, extra: string[] = []): Promise<{ code: number; text: string }> {
  const input = join(dir, `${name}.jsonl`);
  writeFileSync(input, `${lines.join("\n")}\n`);
  const out = join(dir, `${name}.csv`);
  const write = process.stderr.write;
  process.stderr.write = (() => true) as typeof process.stderr.write;
  try {
    const code = await main(["batch", "--in", input, "--out", out, "--workers", "0", ...extra]);
    return { code, text: readFileSync(out, "utf8") };
  } finally {
    process.stderr.write = write;
  }
}
const headerOf = (text: string) => (parse(text) as string[][])[0];

describe("the batch's CSV header without --procedure", () => {
  const op = example("operatingPoint");
  const show = example("catalog.show");

  it("holds the result columns of the procedures the input names, and no other procedure's", async () => {
    const r = await run([op, show, op], "mixed");
    expect(r.code).toBe(0);
    const header = headerOf(r.text);
    expect(header).toEqual([...BASE_COLUMNS, ...resultColumns(["operatingPoint", "catalog.show"])]);
    expect(header?.length).toBeLessThan(BASE_COLUMNS.length + resultColumns(undefined).length);
    // columns only another procedure's output has are not there (holdUp's per-stage rows, review's candidates)
    const others = resultColumns(["holdUp", "review"]).filter(
      (c) => !resultColumns(["operatingPoint", "catalog.show"]).includes(c),
    );
    expect(others.length).toBeGreaterThan(0);
    for (const c of others) expect(header).not.toContain(c);
    // a catalog.show row's part lands in its own columns
    const rows = parse(r.text, { columns: true }) as Record<string, string>[];
    expect(rows[1]?.["part.id"]).toBe("demo-schottky-5a-45v");
  });

  it("with one procedure named, the header and rows are those of --procedure for it", async () => {
    const plain = await run([op, op], "one");
    const named = await run([op, op], "one-named", ["--procedure", "operatingPoint"]);
    expect(plain.text).toBe(named.text);
  });

  it("every shard reads the whole input for it, so the shards' headers agree and merge to the unsharded output", async () => {
    // shard 0 holds only operatingPoint lines, shard 1 only catalog.show lines
    const lines = [op, show, op, show];
    const whole = await run(lines, "whole");
    const shards = [0, 1].map((i) => join(dir, `shard-${i}.csv`));
    for (const i of [0, 1]) {
      const s = await run(lines, `part-${i}`, ["--shard", `${i}/2`]);
      writeFileSync(shards[i] as string, s.text);
      expect(headerOf(s.text)).toEqual(headerOf(whole.text));
    }
    const merged = join(dir, "merged.csv");
    const write = process.stderr.write;
    process.stderr.write = (() => true) as typeof process.stderr.write;
    try {
      expect(await main(["merge", "--out", merged, ...shards])).toBe(0);
    } finally {
      process.stderr.write = write;
    }
    expect(readFileSync(merged, "utf8")).toBe(whole.text);
  });
});
