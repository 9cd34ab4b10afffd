import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { stringify } from "csv-stringify/sync";
import { afterAll, describe, expect, it } from "vitest";
import { Readable } from "node:stream";
import { cellValue } from "../../../adapters/batch/formats.js";
import type { BatchOutputLine } from "../../../adapters/batch/line.js";
import { recordChunks } from "../../../adapters/batch/reader.js";
import { main } from "../../../adapters/batch/cli.js";
import { catalogOf, loadCatalogFile } from "../../../adapters/catalog/file-catalog.js";
import { DEMO_CATALOG } from "../../../adapters/project-root.js";
import { catalogFile } from "../../../contracts/catalog.js";

// An approved-parts list as an ERP/PLM export would give it: 500 invented parts made from the demo
// catalog's invented parts (ids, names and one rating varied), one part a row, dotted columns.
type Json = Record<string, unknown>;
// the demo parts as loaded (a curve its file references read in as points)
const templates = loadCatalogFile(DEMO_CATALOG()).list() as unknown as Json[];

function demoLikeParts(n: number): Json[] {
  return Array.from({ length: n }, (_, i) => {
    const t = structuredClone(templates[i % templates.length]) as Json & { stage: Json };
    const id = `import-${String(i).padStart(3, "0")}-${t.id as string}`;
    return {
      ...t,
      id,
      description: `imported ${t.description as string} #${i}`,
      stage: { ...t.stage, name: `imported part ${i}`, costEach: Math.round((0.05 + i / 1000) * 1000) / 1000 },
    };
  });
}

/** A value as the cell a person types for it: a string that would read as something else is quoted JSON. */
function cellOf(v: unknown): string {
  if (typeof v === "string") {
    const read = cellValue(v);
    return read.present && read.value === v ? v : JSON.stringify(v);
  }
  return String(v);
}

/** The parts as dotted columns (arrays by index), the columns in order of first appearance. */
function toCsv(parts: Json[]): { text: string; header: string[]; rows: Map<string, string>[] } {
  const header: string[] = [];
  const rows = parts.map((p) => {
    const row = new Map<string, string>();
    const walk = (v: unknown, path: string) => {
      if (typeof v === "object" && v !== null) {
        for (const [k, x] of Object.entries(v)) walk(x, path === "" ? k : `${path}.${k}`);
        return;
      }
      if (!header.includes(path)) header.push(path);
      row.set(path, cellOf(v));
    };
    walk(p, "");
    return row;
  });
  const text = stringify([header, ...rows.map((r) => header.map((h) => r.get(h) ?? ""))]);
  return { text, header, rows };
}

const dir = mkdtempSync(join(tmpdir(), "backstop-csv-import-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function runImport(text: string, out: string, extra: string[] = []) {
  const csv = join(dir, `in-${Math.random().toString(36).slice(2)}.csv`);
  writeFileSync(csv, text);
  const lines: string[] = [];
  const write = process.stderr.write;
  process.stderr.write = ((s: string) => {
    lines.push(...String(s).split("\n").filter(Boolean));
    return true;
  }) as typeof process.stderr.write;
  try {
    return { code: await main(["catalog", "import", "--csv", csv, "--out", out, ...extra]), lines };
  } finally {
    process.stderr.write = write;
  }
}

describe("backstop catalog import --csv", () => {
  const parts = demoLikeParts(500);
  const csv = toCsv(parts);

  it("a good 500-part CSV round-trips: import, load, the same parts and stamp", async () => {
    const out = join(dir, "good.json");
    const r = await runImport(csv.text, out, ["--name", "imported demo list"]);
    expect(r.lines.join("\n")).toMatch(/500 parts -> .*good\.json \(catalog "imported demo list", sha256:/);
    expect(r.code).toBe(0);
    const loaded = loadCatalogFile(out);
    const expected = catalogFile.parse({ catalog: "imported demo list", parts }).parts;
    expect(loaded.list()).toEqual(expected);
    expect(loaded.stamp).toEqual(catalogOf("imported demo list", expected).stamp);
    expect(loaded.stamp.partCount).toBe(500);
  });

  it("three bad cells among 500 rows: refused, all three positions listed, nothing written", async () => {
    const bad = [
      { part: 56, column: "stage.reverseRatingV", cell: "12 A" }, // a current where a voltage goes
      { part: 203, column: "stage.kind", cell: "schotky-diode" }, // a kind misspelt
      { part: 444, column: "stage.tjMaxC", cell: "{150" }, // a cell that starts as JSON and is not
    ];
    const rows = csv.rows.map((r) => new Map(r));
    for (const b of bad) {
      // the first part from there on that has the column
      while (!rows[b.part]?.has(b.column)) b.part += 1;
      rows[b.part]?.set(b.column, b.cell);
    }
    const text = stringify([csv.header, ...rows.map((r) => csv.header.map((h) => r.get(h) ?? ""))]);
    const out = join(dir, "bad.json");
    const r = await runImport(text, out);
    expect(r.code).toBe(1);
    expect(r.lines[0]).toMatch(/refused, 3 bad cell\(s\) in 500 rows; nothing written to .*bad\.json/);
    const listed = r.lines.slice(1);
    expect(listed).toHaveLength(3);
    bad.forEach((b, k) => {
      // the batch's numbering: part 0 is data row 1, on line 2 of the file (the header is line 1)
      const letter = String.fromCharCode(65 + csv.header.indexOf(b.column)); // fewer than 26 columns precede these
      expect(listed[k]).toContain(
        `row ${b.part + 1} (line ${b.part + 2} of the file), column "${b.column}" (${letter}), cell "${b.cell}": `,
      );
    });
    expect(listed[0]).toMatch(/voltage|V\b/); // what to type instead, in the contract's words
    expect(listed[1]).toMatch(/: expected one of .*schottky-diode.* \(got "schotky-diode"\)$/);
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(dir).filter((f) => f.startsWith("bad.json"))).toEqual([]);
  });

  it("a missing field, an unknown column and a duplicate id are named with the row and what to add", async () => {
    const rows = csv.rows.slice(0, 3).map((r) => new Map(r));
    rows[1]?.set("id", rows[0]?.get("id") as string);
    // two bad cells in one row: an unreadable one and one the contract refuses, both listed
    rows[0]?.set("stage.tjMaxC", "[150");
    rows[0]?.set("stage.reverseRatingV", "-5 V");
    const header = [...csv.header.filter((h) => h !== "description"), "stage.colour"];
    rows[2]?.set("stage.colour", "blue");
    const text = stringify([header, ...rows.map((r) => header.map((h) => r.get(h) ?? ""))]);
    const r = await runImport(text, join(dir, "few.json"));
    expect(r.code).toBe(1);
    const all = r.lines.join("\n");
    const r1 = "row 1 \\(line 2 of the file\\)";
    expect(all).toContain(
      'row 1 (line 2 of the file), column "description": required (a string) (add a column description)',
    );
    expect(all).toMatch(
      new RegExp(`${r1}, column "stage.tjMaxC" \\([A-Z]+\\), cell "\\[150": a cell starting with \\[ is read as JSON`),
    );
    expect(all).toMatch(new RegExp(`${r1}, column "stage.reverseRatingV" \\([A-Z]+\\), cell "-5 V": `));
    expect(all).not.toMatch(new RegExp(`${r1}, column "stage.tjMaxC".*required`));
    expect(all).toMatch(
      /row 3 \(line 4 of the file\), column "stage.colour" \([A-Z]+\), cell "blue": unknown field `colour`/,
    );
    expect(all).toMatch(
      new RegExp(`row 2 \\(line 3 of the file\\), column "id" \\(A\\), cell "[^"]+": duplicate id "[^"]+": also ${r1}`),
    );
  });

  it("names a row as the batch does: the data row (the batch's line) and the line of the file it starts on", async () => {
    // line 1 the header, 2 row 1, 3 a blank row 2, 4-5 row 3 (a quoted cell over two lines), 6 row 4 (a cell short)
    const text = 'id,procedure,description\na,operatingPoint,x\n\nb,operatingPoint,"two\nlines"\nc,operatingPoint\n';
    const r = await runImport(text, join(dir, "places.json"));
    expect(r.code).toBe(1);
    expect(r.lines).toContain('  row 4 (line 6 of the file), column "(row)": expected 3 cells, found 2');
    const answered: BatchOutputLine[] = [];
    for await (const c of recordChunks(Readable.from([text]), "csv", { targetBytes: 1 << 20 }))
      answered.push(...(c.answered ?? []));
    expect(answered).toHaveLength(1);
    const row = answered[0];
    if (row === undefined || row.ok) throw new Error("the short row should be refused");
    expect(row.line).toBe(4);
    expect(row.error.message).toBe("row 4 (line 6 of the file): expected 3 cells, found 2");
  });
});
