import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { PassThrough, Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { type BatchOutputLine, runBatch } from "../../adapters/batch/run-batch.js";
import { projectRoot } from "../../adapters/project-root.js";
import { demoContext } from "../helpers/app.js";
import { ensureBuilt } from "../helpers/build-once.js";

const good = {
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: 2 },
  ambientC: 25,
};

async function batch(lines: string[]): Promise<BatchOutputLine[]> {
  const out = new PassThrough();
  const chunks: string[] = [];
  out.on("data", (c) => chunks.push(String(c)));
  await runBatch(Readable.from([lines.join("\n")]), out, demoContext());
  return chunks
    .join("")
    .trim()
    .split("\n")
    .map((l) => JSON.parse(l) as BatchOutputLine);
}

describe("batch mode", () => {
  it("writes exactly one line per input line that is not blank, in order, with the same id, whatever the line holds", async () => {
    const lines = [
      JSON.stringify({ id: "a", procedure: "operatingPoint", input: good }),
      "{ this is not json",
      JSON.stringify({
        id: "b",
        procedure: "operatingPoint",
        input: { ...good, load: { kind: "constant-current", currentA: "5 V" } },
      }),
      JSON.stringify({ id: "c", procedure: "noSuchThing", input: {} }),
      "",
      JSON.stringify({
        id: 7,
        procedure: "operatingPoint",
        input: { ...good, stage: { kind: "catalog-part", partId: "missing" } },
      }),
      JSON.stringify({ procedure: "operatingPoint", input: good }),
      JSON.stringify([1, 2, 3]),
    ];
    const out = await batch(lines);
    expect(out.map((o) => o.line)).toEqual([1, 2, 3, 4, 6, 7, 8]); // line 5 is blank: skipped, no record
    expect(out.map((o) => o.id)).toEqual(["a", null, "b", "c", 7, null, null]);
    expect(out.map((o) => o.ok)).toEqual([true, false, false, false, false, true, false]);
    const err = (i: number) => {
      const o = out[i];
      if (o === undefined || o.ok) throw new Error(`line ${i} should be an error`);
      return o.error;
    };
    expect(err(1).code).toBe("malformed-line");
    expect(err(2).issues[0]?.path).toEqual(["load", "currentA"]);
    expect(err(3).code).toBe("unknown-procedure");
    expect(err(4).issues[0]?.path).toEqual(["stage", "partId"]);
  });

  it("gives the same numbers as HTTP for the same case (same router in process)", async () => {
    const [o] = await batch([JSON.stringify({ id: "x", procedure: "operatingPoint", input: good })]);
    const { testApp, postTrpc } = await import("../helpers/app.js");
    const http = await postTrpc(testApp().app, "operatingPoint", good);
    expect(o?.ok && o.result).toEqual((http.body as { result: { data: unknown } }).result.data);
  });
});

describe("batch command line", () => {
  const root = projectRoot();
  ensureBuilt();

  it("writes the output under its final name only when complete, exit 1 when some rows failed", () => {
    const dir = mkdtempSync(join(tmpdir(), "backstop-batch-"));
    const inFile = join(dir, "in.jsonl");
    const outFile = join(dir, "out.jsonl");
    writeFileSync(inFile, `${JSON.stringify({ id: 1, procedure: "operatingPoint", input: good })}\nnot json\n`);
    const r = spawnSync("node", [join(root, "bin", "backstop.mjs"), "batch", "--in", inFile, "--out", outFile], {
      encoding: "utf8",
    });
    expect(r.status).toBe(1);
    const lines = readFileSync(outFile, "utf8").trim().split("\n");
    expect(lines).toHaveLength(2);
    const again = spawnSync(
      "node",
      [join(root, "bin", "backstop.mjs"), "batch", "--in", inFile, "--out", `${outFile}.2`],
      { encoding: "utf8" },
    );
    expect(again.status).toBe(1);
    expect(readFileSync(`${outFile}.2`, "utf8")).toBe(readFileSync(outFile, "utf8")); // deterministic
    const missing = spawnSync(
      "node",
      [join(root, "bin", "backstop.mjs"), "batch", "--in", join(dir, "nope.jsonl"), "--out", join(dir, "o3.jsonl")],
      { encoding: "utf8" },
    );
    expect(missing.status).toBe(2);
    expect(existsSync(join(dir, "o3.jsonl"))).toBe(false);
  });

  it("--help prints the usage and exits 0; a CSV that cannot name a procedure is refused before any row (exit 2); blank lines are skipped and counted apart", () => {
    const bin = join(root, "bin", "backstop.mjs");
    for (const args of [["--help"], ["batch", "--help"], ["merge", "--help"]]) {
      const r = spawnSync("node", [bin, ...args], { encoding: "utf8" });
      expect(r.status, args.join(" ")).toBe(0);
      expect(r.stdout).toMatch(/^usage:/);
    }
    const dir = mkdtempSync(join(tmpdir(), "backstop-batch-"));
    const csv = join(dir, "in.csv");
    writeFileSync(csv, "id,supplyV,ambientC\n1,12,25\n");
    const r = spawnSync("node", [bin, "batch", "--in", csv, "--out", join(dir, "out.jsonl")], { encoding: "utf8" });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/no "procedure" column and no --procedure was given/);
    expect(existsSync(join(dir, "out.jsonl"))).toBe(false);
    const jsonl = join(dir, "in.jsonl");
    writeFileSync(
      jsonl,
      `${JSON.stringify({ id: 1, procedure: "operatingPoint", input: good })}\n\n   \n${JSON.stringify({ id: 2, procedure: "operatingPoint", input: good })}\n`,
    );
    const b = spawnSync("node", [bin, "batch", "--in", jsonl, "--out", join(dir, "out2.jsonl")], { encoding: "utf8" });
    expect(b.status).toBe(0);
    expect(b.stderr).toMatch(/2 rows, 0 rejected, 2 blank lines skipped/);
    expect(
      readFileSync(join(dir, "out2.jsonl"), "utf8")
        .trim()
        .split("\n")
        .map((l) => (JSON.parse(l) as { line: number }).line),
    ).toEqual([1, 4]);
  });
});
