import { mkdirSync, mkdtempSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { streamBatch } from "../../adapters/batch/engine.js";
import type { BatchOutputLine } from "../../adapters/batch/line.js";
import { loadCatalogFile } from "../../adapters/catalog/file-catalog.js";
import { resolveCurveFiles } from "../../adapters/curves/curve-files.js";
import { DEMO_CATALOG } from "../../adapters/project-root.js";
import { appRouter } from "../../api/router.js";
import { demoContext, postTrpc, testApp } from "../helpers/app.js";

// A digitised curve as a CSV file must reach the fit as the same points given inline: the
// oracle is the inline form itself (the fit procedure on the same numbers), read here from the
// file's text independently of the adapter.
const caller = appRouter.createCaller(demoContext());
const dir = mkdtempSync(join(tmpdir(), "backstop-curves-"));
const curvesDir = join(dir, "curves");
mkdirSync(curvesDir);
const VF_CSV = [
  "currentA,voltageV,tempC",
  "0.1,0.308,25",
  "500 mA,366 mV,25",
  "1,0.400,25",
  "",
  "3,0.492,25",
  "6,0.602,25",
  "0.5,0.222,125",
  "2,0.320,125",
  "6,0.482,125",
].join("\n");
writeFileSync(join(curvesDir, "vf.csv"), `${VF_CSV}\n`);
const inlinePoints = [
  { currentA: 0.1, voltageV: 0.308, tempC: 25 },
  { currentA: "500 mA", voltageV: "366 mV", tempC: 25 },
  { currentA: 1, voltageV: 0.4, tempC: 25 },
  { currentA: 3, voltageV: 0.492, tempC: 25 },
  { currentA: 6, voltageV: 0.602, tempC: 25 },
  { currentA: 0.5, voltageV: 0.222, tempC: 125 },
  { currentA: 2, voltageV: 0.32, tempC: 125 },
  { currentA: 6, voltageV: 0.482, tempC: 125 },
];
const fitOf = (points: unknown) => ({
  curve: "diode-forward",
  junction: "schottky",
  diode: { model: "points", points },
});
const scope = { baseDir: dir, root: dir };
const problemsOf = (csvName: string, text?: string) => {
  if (text !== undefined) writeFileSync(join(curvesDir, csvName), text);
  const r = resolveCurveFiles(fitOf({ csv: `curves/${csvName}` }), scope);
  if (r.ok) throw new Error("resolved");
  return r.problems.map((p) => p.message);
};

describe("curves as CSV files (batch and catalog files)", () => {
  it("a digitised curve in a CSV gives the same fit as the same points inline", async () => {
    const r = resolveCurveFiles(fitOf({ csv: "curves/vf.csv" }), scope);
    if (!r.ok) throw new Error(JSON.stringify(r.problems));
    expect(r.files).toBe(1);
    const fromFile = await caller.fit(r.value as never);
    const inline = await caller.fit(fitOf(inlinePoints) as never);
    expect(fromFile).toEqual(inline);
    expect(fromFile.method).toBe("least-squares");
  });

  it("a two-column curve (Zth(t), columns in the file's own order) gives the same Foster fit as inline", async () => {
    const times = Array.from({ length: 9 }, (_, i) => 1e-4 * 10 ** (i / 2));
    const zth = (t: number) => 0.5 * -Math.expm1(-t / 1e-3) + 1.5 * -Math.expm1(-t / 0.3);
    writeFileSync(join(curvesDir, "zth.csv"), `zthKPerW,timeS\n${times.map((t) => `${zth(t)},${t}`).join("\n")}\n`);
    const r = resolveCurveFiles({ curve: "zth", steadyKPerW: 2, points: { csv: "curves/zth.csv" } }, scope);
    if (!r.ok) throw new Error(JSON.stringify(r.problems));
    const inline = { curve: "zth", steadyKPerW: 2, points: times.map((timeS) => ({ timeS, zthKPerW: zth(timeS) })) };
    expect(await caller.fit(r.value as never)).toEqual(await caller.fit(inline as never));
  });

  it("reports a bad cell by its line and column, with the point's own contract message", () => {
    const msgs = problemsOf("bad.csv", "currentA,voltageV,tempC\n0.1,0.308,25\n0.5,abc,25\n-1,0.4,25\n2,0.5\n3,0.6,\n");
    expect(msgs).toHaveLength(3);
    expect(msgs[0]).toMatch(/curve file "curves\/bad.csv" line 3, column voltageV \("abc"\): /);
    expect(msgs[1]).toMatch(/line 4, column currentA \("-1"\): must be greater than 0 A/);
    expect(msgs[2]).toMatch(/line 5: 2 cells, the header has 3 \(currentA,voltageV,tempC\)/);
    // line 6's empty tempC is an absent optional field, not a fault
  });

  it("refuses a header that names no curve's columns, listing the headers it takes", () => {
    const [msg] = problemsOf("units.csv", "current_A,vf_V,tj_C\n1,0.4,25\n");
    expect(msg).toMatch(/header current_A,vf_V,tj_C names no curve's columns/);
    expect(msg).toMatch(/currentA,voltageV\[,tempC\] \(diode forward Vf\(I, T\)\)/);
    expect(msg).toMatch(/timeS,zthKPerW \(single-pulse Zth\(t\)\)/);
  });

  it("refuses paths out of the folder, absolute paths, links out, other names and missing files", () => {
    const outside = mkdtempSync(join(tmpdir(), "backstop-outside-"));
    writeFileSync(join(outside, "vf.csv"), `${VF_CSV}\n`);
    symlinkSync(join(outside, "vf.csv"), join(curvesDir, "link.csv"));
    const refused = (name: string) => {
      const r = resolveCurveFiles(fitOf({ csv: name }), { baseDir: curvesDir, root: dir });
      if (r.ok) throw new Error(`${name} resolved`);
      expect(r.problems[0]?.path).toEqual(["diode", "points"]);
      return r.problems[0]?.message ?? "";
    };
    expect(refused("../../outside/vf.csv")).toMatch(/leaves the folder curve files are read from/);
    expect(refused(`../../${outside.split("/").pop()}/vf.csv`)).toMatch(/leaves the folder/);
    expect(refused(join(outside, "vf.csv"))).toMatch(/give a path relative to the referencing file's folder/);
    expect(refused("link.csv")).toMatch(/is a link out of the folder/);
    expect(refused("vf.txt")).toMatch(/a curve file's name ends in \.csv/);
    expect(refused("none.csv")).toMatch(/no such file/);
    // relative to the referencing file's folder: from curves/, "vf.csv" is curves/vf.csv
    expect(resolveCurveFiles(fitOf({ csv: "vf.csv" }), { baseDir: curvesDir, root: dir }).ok).toBe(true);
  });

  it("refuses a file over BACKSTOP_MAX_CURVE_FILE_BYTES (64 KiB), naming the limit", () => {
    const rows = Array.from({ length: 4000 }, (_, i) => `${(i + 1) / 100},${0.3 + i / 1e5},25`);
    const [msg] = problemsOf("big.csv", `currentA,voltageV,tempC\n${rows.join("\n")}\n`);
    expect(msg).toMatch(/is \d+ bytes: at most 65536 \(limit BACKSTOP_MAX_CURVE_FILE_BYTES\)/);
  });

  it("a catalog part takes its curve from a CSV beside the catalog (the demo PN rectifier)", () => {
    const part = loadCatalogFile(DEMO_CATALOG()).find("demo-pn-rectifier-5a-200v-csv");
    const text = readFileSync(join(DEMO_CATALOG(), "..", "curves", "demo-pn-5a-200v-vf.csv"), "utf8");
    const [, ...rows] = text.trim().split("\n");
    const expected = rows.map((row) => {
      const [currentA, voltageV, tempC] = row.split(",").map(Number);
      return { currentA, voltageV, tempC };
    });
    expect(part?.stage).toMatchObject({ diode: { model: "points", points: expected, temperatureLaw: "linear" } });
  });

  it("a catalog file with a bad curve file does not load, naming the part and the file's line", () => {
    writeFileSync(join(curvesDir, "cat-bad.csv"), "currentA,voltageV\n1,x\n");
    const catalog = join(dir, "catalog.json");
    const stage = JSON.parse(readFileSync(DEMO_CATALOG(), "utf8")).parts.find(
      (p: { id: string }) => p.id === "demo-pn-rectifier-5a-200v-csv",
    ).stage;
    writeFileSync(
      catalog,
      JSON.stringify({
        catalog: "t",
        parts: [
          {
            id: "p",
            description: "p",
            stage: { ...stage, diode: { ...stage.diode, points: { csv: "curves/cat-bad.csv" } } },
          },
        ],
      }),
    );
    expect(() => loadCatalogFile(catalog)).toThrow(
      /invalid at parts\[0\]\.stage\.diode\.points: curve file "curves\/cat-bad.csv" line 2, column voltageV \("x"\)/,
    );
  });

  it("a batch input file's lines take curve files from its folder; a bad one is that line's error row", async () => {
    const lines = [
      { id: "file", procedure: "fit", input: fitOf({ csv: "curves/vf.csv" }) },
      { id: "inline", procedure: "fit", input: fitOf(inlinePoints) },
      { id: "out", procedure: "fit", input: fitOf({ csv: "../vf.csv" }) },
    ];
    const out: string[] = [];
    const run = (curveFolder: string | undefined) =>
      streamBatch({
        input: Readable.from([lines.map((l) => JSON.stringify(l)).join("\n")]),
        inFormat: "jsonl",
        outFormat: "jsonl",
        ctx: demoContext(),
        curveFolder,
        write: async (c) => {
          out.push(typeof c === "string" ? c : Buffer.from(c).toString("utf8"));
        },
      });
    const counts = await run(dir);
    const rows = out
      .join("")
      .trim()
      .split("\n")
      .map((l) => JSON.parse(l) as BatchOutputLine);
    expect(counts).toMatchObject({ lines: 3, ok: 2, failed: 1 });
    const [file, inline, outside] = rows;
    if (!file?.ok || !inline?.ok) throw new Error(JSON.stringify(rows));
    expect(file.result).toEqual(inline.result);
    if (outside?.ok !== false) throw new Error("the ../ line was answered");
    expect(outside.line).toBe(3);
    expect(outside.error.code).toBe("invalid-input");
    expect(outside.error.issues[0]?.path).toEqual(["diode", "points"]);
    expect(outside.error.message).toMatch(/"..\/vf.csv" leaves the folder/);
    // No folder (a stream, not a file): the contract refuses the reference, saying to send the points inline.
    out.length = 0;
    await run(undefined);
    const noFolder = JSON.parse(out.join("").trim().split("\n")[0] ?? "") as BatchOutputLine;
    expect(noFolder.ok).toBe(false);
    if (!noFolder.ok)
      expect(noFolder.error.message).toMatch(/send the points inline, \[\{ currentA, voltageV, tempC \}/);
  });

  it("a CSV batch row takes a curve file through its column (input path diode.points.csv)", async () => {
    const out: string[] = [];
    await streamBatch({
      input: Readable.from([
        "id,procedure,curve,junction,diode.model,diode.points.csv\nr1,fit,diode-forward,schottky,points,curves/vf.csv\n",
      ]),
      inFormat: "csv",
      outFormat: "jsonl",
      ctx: demoContext(),
      curveFolder: dir,
      write: async (c) => {
        out.push(typeof c === "string" ? c : Buffer.from(c).toString("utf8"));
      },
    });
    const row = JSON.parse(out.join("").trim()) as BatchOutputLine;
    if (!row.ok) throw new Error(JSON.stringify(row.error));
    expect(row.result).toEqual(await caller.fit(fitOf(inlinePoints) as never));
  });

  it("over HTTP a curve file reference is refused, saying what to send instead (the server reads no caller-named file)", async () => {
    const { app } = testApp();
    const r = await postTrpc(app, "fit", { curve: "zth", points: { csv: "curves/zth.csv" } });
    expect(r.status).toBe(400);
    const b = (r.body as { error: { data: { backstop: { issues: { path: unknown[]; message: string }[] } } } }).error
      .data.backstop;
    expect(b.issues).toEqual([
      {
        path: ["points"],
        message: expect.stringMatching(
          /never from a request: send the points inline, \[\{ timeS, zthKPerW \}, \.\.\.\]/,
        ),
      },
    ]);
  });
});
