import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { parseShard } from "../../adapters/batch/cli.js";
import { cellValue, csvRowToLine, setPath } from "../../adapters/batch/formats.js";
import { builtCli } from "../helpers/build-once.js";

const bin = builtCli();
const good = (a: number) => ({
  stage: { kind: "catalog-part", partId: "demo-schottky-5a-45v" },
  supplyV: 12,
  load: { kind: "constant-current", currentA: a },
  ambientC: 25,
});
const runAsync = (args: string[], env: Record<string, string> = {}) =>
  new Promise<number | null>((resolve) =>
    spawn("node", [bin, ...args], { env: { ...process.env, ...env }, stdio: "ignore" }).on("exit", (c) => resolve(c)),
  );
const run = (args: string[], env: Record<string, string> = {}) =>
  spawnSync("node", [bin, ...args], { encoding: "utf8", env: { ...process.env, ...env } });

function mixedFile(dir: string, n: number): string {
  const lines: string[] = [];
  for (let i = 0; i < n; i += 1) {
    if (i % 7 === 3) lines.push("{ not json");
    else if (i % 7 === 5)
      lines.push(JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: { ...good(1), supplyV: "12 A" } }));
    else lines.push(JSON.stringify({ id: `r${i}`, procedure: "operatingPoint", input: good((i % 40) / 10) }));
  }
  const file = join(dir, "in.jsonl");
  writeFileSync(file, `${lines.join("\n")}\n`);
  return file;
}

describe("CSV mapping (dotted column names)", () => {
  it("reads cells as numbers, strings with units or JSON, and builds the nested input", () => {
    expect(cellValue("12")).toEqual({ present: true, value: 12 });
    expect(cellValue("12 V")).toEqual({ present: true, value: "12 V" });
    expect(cellValue('"007"')).toEqual({ present: true, value: "007" });
    expect(cellValue("")).toEqual({ present: false });
    const o: Record<string, unknown> = {};
    setPath(o, "stage.rdsOn.0.gateSourceV", 10);
    expect(o).toEqual({ stage: { rdsOn: [{ gateSourceV: 10 }] } });
    const r = csvRowToLine(
      ["id", "stage.kind", "stage.partId", "supplyV"],
      ["a1", "catalog-part", "p", "12 V"],
      "operatingPoint",
    );
    expect(r).toEqual({
      raw: JSON.stringify({
        id: "a1",
        procedure: "operatingPoint",
        input: { stage: { kind: "catalog-part", partId: "p" }, supplyV: "12 V" },
      }),
    });
    expect("error" in csvRowToLine(["id", "supplyV"], ["1"], "operatingPoint")).toBe(true);
  });
  it("takes the shard index from JOB_COMPLETION_INDEX", () => {
    expect(parseShard("2/4", {})).toEqual({ index: 2, count: 4 });
    expect(parseShard("4", { JOB_COMPLETION_INDEX: "3" })).toEqual({ index: 3, count: 4 });
    expect(() => parseShard("4/4", {})).toThrow();
    expect(() => parseShard("4", {})).toThrow();
  });
});

describe("backstop batch at scale (built CLI, worker threads)", () => {
  const dir = mkdtempSync(join(tmpdir(), "backstop-scale-"));
  const input = mixedFile(dir, 700);

  it("good, bad and malformed lines: one output line each, in order; exit 1; a rerun is byte-identical", () => {
    const a = run(["batch", "--in", input, "--out", join(dir, "a.jsonl"), "--workers", "2"]);
    expect(a.status).toBe(1);
    expect(a.stderr).toMatch(/700 rows, 200 rejected/);
    const out = readFileSync(join(dir, "a.jsonl"), "utf8")
      .trim()
      .split("\n")
      .map((l) => JSON.parse(l) as { line: number; ok: boolean; error?: { code: string } });
    expect(out.map((o) => o.line)).toEqual(Array.from({ length: 700 }, (_, i) => i + 1));
    expect(out[3]?.error?.code).toBe("malformed-line");
    expect(out[5]?.error?.code).toBe("invalid-input");
    expect(out[0]?.ok).toBe(true);
    const b = run(["batch", "--in", input, "--out", join(dir, "b.jsonl"), "--workers", "0"]); // in process: same bytes
    expect(b.status).toBe(1);
    expect(readFileSync(join(dir, "b.jsonl"), "utf8")).toBe(readFileSync(join(dir, "a.jsonl"), "utf8"));
  });

  it("--shard i/N over N shards, merged, equals the unsharded output", async () => {
    const codes = await Promise.all(
      [0, 1, 2].map((i) =>
        runAsync(["batch", "--in", input, "--out", join(dir, "s-{shard}.jsonl"), "--shard", "3", "--workers", "0"], {
          JOB_COMPLETION_INDEX: String(i),
        }),
      ),
    );
    expect(codes).toEqual([1, 1, 1]);
    const shards = [0, 1, 2].map((i) => join(dir, `s-${i}.jsonl`));
    expect(run(["merge", "--out", join(dir, "merged.jsonl"), ...shards]).status).toBe(0);
    expect(readFileSync(join(dir, "merged.jsonl"), "utf8")).toBe(readFileSync(join(dir, "a.jsonl"), "utf8"));
    // a shard left out (a gap in the line numbers) or given twice: refused, nothing written
    const gap = run(["merge", "--out", join(dir, "gap.jsonl"), shards[0] as string, shards[2] as string]);
    expect(gap.status).toBe(2);
    expect(String(gap.stderr)).toMatch(/line 2 is in none of the shard files: give every shard of the run/);
    const twice = run(["merge", "--out", join(dir, "twice.jsonl"), ...shards, shards[1] as string]);
    expect(twice.status).toBe(2);
    expect(String(twice.stderr)).toMatch(/line 2 appears twice/);
    expect(existsSync(join(dir, "gap.jsonl")) || existsSync(join(dir, "twice.jsonl"))).toBe(false);
  });

  it("CSV in and out with a header from the output contract; sharded CSV merges to the same file", async () => {
    const csv = [
      "id,procedure,stage.kind,stage.partId,supplyV,load.kind,load.currentA,ambientC",
      "c1,operatingPoint,catalog-part,demo-schottky-5a-45v,12 V,constant-current,2,25",
      "c2,operatingPoint,catalog-part,demo-schottky-5a-45v,12 A,constant-current,2,25",
      "c3,operatingPoint,catalog-part",
      'c4,operatingPoint,catalog-part,demo-schottky-5a-45v,24,constant-current,"1.5 A",85',
    ].join("\n");
    writeFileSync(join(dir, "in.csv"), `${csv}\n`);
    const r = run([
      "batch",
      "--in",
      join(dir, "in.csv"),
      "--out",
      join(dir, "out.csv"),
      "--procedure",
      "operatingPoint",
      "--workers",
      "1",
    ]);
    expect(r.status).toBe(1);
    const rows = readFileSync(join(dir, "out.csv"), "utf8").trim().split("\n");
    expect(rows).toHaveLength(5);
    const table = parse(readFileSync(join(dir, "out.csv"), "utf8")) as string[][];
    const head = table[0] as string[];
    expect(head.slice(0, 3)).toEqual(["line", "id", "ok"]);
    expect(head).toContain("point.tjC");
    expect(rows[1]).toMatch(/^1,c1,true,/);
    expect(rows[2]).toMatch(/^2,c2,false,invalid-input,/);
    expect(rows[3]).toMatch(/^3,c3,false,malformed-line,/);
    expect(Number(table[4]?.[head.indexOf("point.tjC")])).toBeGreaterThan(85);
    await Promise.all(
      [0, 1].map((i) =>
        runAsync([
          "batch",
          "--in",
          join(dir, "in.csv"),
          "--out",
          join(dir, `c-${i}.csv`),
          "--procedure",
          "operatingPoint",
          "--shard",
          `${i}/2`,
          "--workers",
          "0",
        ]),
      ),
    );
    expect(run(["merge", "--out", join(dir, "cm.csv"), join(dir, "c-0.csv"), join(dir, "c-1.csv")]).status).toBe(0);
    expect(readFileSync(join(dir, "cm.csv"), "utf8")).toBe(readFileSync(join(dir, "out.csv"), "utf8"));
  });

  it("exit 2 when it cannot run; nothing under the final name", () => {
    expect(run(["batch", "--in", join(dir, "missing.jsonl"), "--out", join(dir, "m.jsonl")]).status).toBe(2);
    expect(run(["batch", "--in", input, "--out", join(dir, "m.jsonl"), "--shard", "9/3"]).status).toBe(2);
    expect(existsSync(join(dir, "m.jsonl"))).toBe(false);
  });

  it("killed mid-run (SIGTERM, and SIGKILL) leaves no partial file under the final name", async () => {
    const big = join(dir, "big.jsonl");
    writeFileSync(
      big,
      `${Array.from({ length: 60_000 }, (_, i) => JSON.stringify({ id: i, procedure: "operatingPoint", input: good((i % 40) / 10) })).join("\n")}\n`,
    );
    for (const signal of ["SIGTERM", "SIGKILL"] as const) {
      const out = join(dir, `killed-${signal}.jsonl`);
      const child = spawn("node", [bin, "batch", "--in", big, "--out", out, "--workers", "1"], {
        env: { ...process.env, BACKSTOP_PROGRESS_MS: "1" },
        stdio: ["ignore", "ignore", "pipe"],
      });
      await new Promise<void>((resolve) =>
        child.stderr.on("data", (d: Buffer) => (/\d+ rows/.test(String(d)) ? resolve() : undefined)),
      );
      child.kill(signal);
      const code = await new Promise<number | null>((r) => child.on("exit", (c) => r(c)));
      expect(existsSync(out)).toBe(false);
      if (signal === "SIGTERM") {
        expect(code).toBe(2);
        expect(readdirSync(dir).filter((f) => f.startsWith(`killed-${signal}`))).toEqual([]); // temp file removed too
      }
    }
  }, 60_000);
});
