import { parse } from "csv-parse/sync";
import type { z } from "zod";
import { catalogEntry, type catalogFile } from "../../contracts/catalog.js";
import { issuesOf } from "../../contracts/zod-messages.js";
import { CSV_HEADER_TEXT, type CsvRowPlace, csvPlaceText, csvRowCounter } from "../batch/csv-rows.js";
import { cellsToObject, columnPath } from "../batch/formats.js";

/** A cell of the CSV that keeps the import from being written: where, what it held, what to type instead. */
export interface CsvCellProblem {
  /** the data row and the line of the file it starts on, as the batch numbers a CSV's rows (absent: the header) */
  readonly place?: CsvRowPlace;
  /** the column's name (a dotted path, as in the batch's CSV), or the field's path where no column holds it */
  readonly column: string;
  /** the column's letter as a spreadsheet shows it (A, B, …, AA), absent where no column holds the field */
  readonly letter?: string;
  readonly cell?: string;
  readonly message: string;
}

export type CsvImport =
  | { readonly ok: true; readonly file: z.input<typeof catalogFile>; readonly parts: number }
  | { readonly ok: false; readonly problems: readonly CsvCellProblem[]; readonly rows: number };

/** A column's letters (0 → A, 25 → Z, 26 → AA). */
export function columnLetter(index: number): string {
  let n = index + 1;
  let s = "";
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

const samePath = (a: readonly (string | number)[], b: readonly (string | number)[], n: number) => {
  for (let i = 0; i < n; i += 1) if (a[i] !== b[i]) return false;
  return true;
};

/**
 * The column an issue at `path` belongs to: the column of that path, else the column holding a
 * JSON cell the path is inside (`stage.diode.points` holding `[...]`), else the first column inside
 * the path (an issue on an object, e.g. a union's kind), else none: the field has no column.
 */
function columnOf(paths: readonly (string | number)[][], path: readonly (string | number)[]): number {
  let inside = -1;
  let below = -1;
  for (let i = 0; i < paths.length; i += 1) {
    const c = paths[i] as (string | number)[];
    if (c.length === path.length && samePath(c, path, c.length)) return i;
    if (c.length < path.length && samePath(c, path, c.length)) {
      if (inside < 0 || c.length > (paths[inside] as unknown[]).length) inside = i;
    } else if (c.length > path.length && below < 0 && samePath(c, path, path.length)) below = i;
  }
  return inside >= 0 ? inside : below;
}

const shown = (cell: string) => (cell.length > 40 ? `${cell.slice(0, 37)}...` : cell);

/**
 * An approved-parts list exported as CSV → a catalog file named `name`: one part a row, each
 * column a dotted path into the part as the batch's CSV columns are into an input (`id`,
 * `description`, `stage.kind`, `stage.diode.saturationCurrentA`, `stage.diode.points` as JSON or
 * `stage.diode.points.0.currentA`; cells read as the batch reads them, `cellsToObject`), each row
 * checked by the catalog's contract. Either every row passes, and the file is the parts as given
 * (units as typed, so the file reads as the CSV did), or the answer lists every bad cell of every
 * row, with the contract's message (what to type instead); blank rows are skipped.
 */
export function importCatalogCsv(text: string, name: string): CsvImport {
  const read = parse(text, { bom: true, relax_column_count: true, skip_empty_lines: false, info: true }) as unknown as {
    record: string[];
    info: { lines: number };
  }[];
  const placeOf = csvRowCounter();
  const places = read.map((r) => placeOf(r.info.lines));
  const problems: CsvCellProblem[] = [];
  const header = (read[0]?.record ?? []).map((h) => h.trim());
  const seen = new Map<string, number>();
  header.forEach((h, i) => {
    const letter = columnLetter(i);
    if (h === "") problems.push({ column: `(column ${letter})`, letter, message: "a column needs a name" });
    else if (seen.has(h))
      problems.push({ column: h, letter, message: `also column ${columnLetter(seen.get(h) as number)}` });
    else seen.set(h, i);
  });
  if (header.length === 0) problems.push({ column: "(header)", message: "the CSV is empty: no header row" });
  if (problems.length > 0) return { ok: false, problems, rows: 0 };

  const paths = header.map(columnPath);
  const parts: unknown[] = [];
  const rowOfId = new Map<string, CsvRowPlace>();
  let rows = 0;
  for (let r = 1; r < read.length; r += 1) {
    const cells = read[r]?.record as string[];
    const place = places[r] as CsvRowPlace;
    if (cells.every((c) => c.trim() === "")) continue;
    rows += 1;
    if (cells.length !== header.length) {
      problems.push({ place, column: "(row)", message: `expected ${header.length} cells, found ${cells.length}` });
      continue;
    }
    const at = (index: number, message: string): CsvCellProblem => ({
      place,
      column: header[index] as string,
      letter: columnLetter(index),
      cell: shown(cells[index] as string),
      message,
    });
    // a cell that cannot be read is left out of the part (and its column out of the contract's issues)
    const { value, problems: cellProblems } = cellsToObject(header, cells);
    for (const p of cellProblems) problems.push(at(p.index, p.message));
    const unread = new Set(cellProblems.map((p) => p.index));
    const id = value.id;
    if (typeof id === "string") {
      const first = rowOfId.get(id);
      if (first !== undefined)
        problems.push(at(header.indexOf("id"), `duplicate id "${id}": also ${csvPlaceText(first)}`));
      else rowOfId.set(id, place);
    }
    const parsed = catalogEntry.safeParse(value);
    if (!parsed.success) {
      for (const issue of issuesOf(parsed.error.issues)) {
        const index = columnOf(paths, issue.path);
        if (unread.has(index)) continue;
        const dotted = issue.path.join(".");
        if (index < 0) problems.push({ place, column: dotted, message: `${issue.message} (add a column ${dotted})` });
        else
          problems.push(
            at(index, pathsEqual(paths[index], issue.path) ? issue.message : `${dotted}: ${issue.message}`),
          );
      }
      continue;
    }
    if (cellProblems.length === 0) parts.push(value);
  }
  if (problems.length > 0) return { ok: false, problems, rows };
  return {
    ok: true,
    file: { catalog: name, parts: parts as z.input<typeof catalogFile>["parts"] },
    parts: parts.length,
  };
}

function pathsEqual(a: readonly (string | number)[] | undefined, b: readonly (string | number)[]): boolean {
  return a !== undefined && a.length === b.length && samePath(a, b, a.length);
}

/** One problem as a line: `row 17 (line 18 of the file), column "stage.reverseRatingV" (F), cell "abc": expected …`. */
export function problemLine(p: CsvCellProblem): string {
  const row = p.place === undefined ? CSV_HEADER_TEXT : csvPlaceText(p.place);
  const where = `${row}, column "${p.column}"${p.letter === undefined ? "" : ` (${p.letter})`}`;
  return `${where}${p.cell === undefined ? "" : `, cell "${p.cell}"`}: ${p.message}`;
}
