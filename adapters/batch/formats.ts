import { stringify } from "csv-stringify/sync";
import { z } from "zod";
import { procedureEntries } from "../../api/procedure-registry.js";
import type { ErrorBody } from "../../contracts/outcome.js";
import { PROTOTYPE_KEYS, unknownFieldMessage } from "../../contracts/zod-messages.js";
import type { BatchOutputLine } from "./line.js";

export type Format = "jsonl" | "csv";
export const formatOf = (file: string, given: string | undefined): Format => {
  if (given === "csv" || given === "jsonl") return given;
  if (given !== undefined) throw new Error(`unknown format "${given}" (jsonl or csv)`);
  return /\.csv$/i.test(file) ? "csv" : "jsonl";
};

/**
 * CSV cell → JSON value: empty → absent; a cell starting with `{`, `[` or `"` is JSON (so `"123"` is
 * the string 123); a JSON number → a number; `true`/`false` → booleans; anything else → the string
 * (quantities with units such as `12 V` stay strings and the contracts parse them).
 */
export function cellValue(cell: string): { present: false } | { present: true; value: unknown } {
  if (cell === "") return { present: false };
  if (/^[{["]/.test(cell)) {
    try {
      return { present: true, value: JSON.parse(cell) as unknown };
    } catch (e) {
      throw new Error(
        `a cell starting with ${cell[0]} is read as JSON, and this is not (${(e as Error).message}): type valid JSON, or the value without the ${cell[0]}`,
      );
    }
  }
  if (/^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?$/.test(cell)) return { present: true, value: Number(cell) };
  if (cell === "true" || cell === "false") return { present: true, value: cell === "true" };
  return { present: true, value: cell };
}

const INDEX = /^(0|[1-9]\d{0,5})$/;

/** A column name's path as an issue path (numeric segments as array indexes). */
export const columnPath = (dotted: string): (string | number)[] =>
  dotted.split(".").map((p) => (INDEX.test(p) ? Number(p) : p));

/** A column that cannot be set, with the path of the segment at fault. */
class ColumnError extends Error {
  constructor(
    message: string,
    readonly path: (string | number)[],
  ) {
    super(message);
  }
}

/**
 * Set `value` at a dotted column name (`stage.partId`, `rdsOn.0.gateSourceV`: a numeric segment is
 * an array index). A segment `__proto__`, `constructor` or `prototype` is refused before anything is
 * set: assigned, it would reach an object's prototype (for every object of the process).
 */
export function setPath(target: Record<string, unknown>, dotted: string, value: unknown): void {
  const parts = dotted.split(".");
  const hostile = parts.findIndex((p) => PROTOTYPE_KEYS.has(p));
  if (hostile >= 0)
    throw new ColumnError(
      unknownFieldMessage(parts[hostile] as string, []),
      columnPath(parts.slice(0, hostile + 1).join(".")),
    );
  let node: Record<string, unknown> | unknown[] = target;
  parts.forEach((part, i) => {
    const last = i === parts.length - 1;
    const key: string | number = Array.isArray(node) ? Number(part) : part;
    if (Array.isArray(node) && !INDEX.test(part))
      throw new Error(`column "${dotted}": "${part}" is not an array index`);
    if (last) {
      (node as Record<string | number, unknown>)[key] = value;
      return;
    }
    const next = (node as Record<string | number, unknown>)[key];
    const wantArray = INDEX.test(parts[i + 1] as string);
    if (next === undefined) {
      const fresh = wantArray ? [] : {};
      (node as Record<string | number, unknown>)[key] = fresh;
      node = fresh;
    } else if (typeof next === "object" && next !== null) node = next as Record<string, unknown>;
    else throw new Error(`column "${dotted}" conflicts with another column`);
  });
}

/** A cell that cannot be set: its column (name and index in the header), the path at fault, why. */
export interface CellProblem {
  readonly column: string;
  readonly index: number;
  readonly path: (string | number)[];
  readonly message: string;
}

/**
 * The cells of one CSV row as the object their dotted column names make (cellValue, setPath),
 * every cell that cannot be read or set listed (the others set); columns in `skip` are left out.
 * The batch's CSV rows and the catalog's CSV import both read rows through it.
 */
export function cellsToObject(
  header: readonly string[],
  cells: readonly string[],
  skip: ReadonlySet<string> = new Set(),
): { value: Record<string, unknown>; problems: CellProblem[] } {
  const value: Record<string, unknown> = {};
  const problems: CellProblem[] = [];
  for (let i = 0; i < header.length; i += 1) {
    const name = header[i] as string;
    if (skip.has(name)) continue;
    try {
      const v = cellValue(cells[i] ?? "");
      if (v.present) setPath(value, name, v.value);
    } catch (e) {
      const message = (e as Error).message;
      problems.push({ column: name, index: i, path: e instanceof ColumnError ? e.path : columnPath(name), message });
    }
  }
  return { value, problems };
}

const BATCH_COLUMNS: ReadonlySet<string> = new Set(["id", "procedure"]);

/** One CSV data row → a batch line `{ id, procedure, input }` as JSON text, or the error it gives. */
export function csvRowToLine(
  header: readonly string[],
  cells: readonly string[],
  procedure: string | undefined,
): { raw: string } | { id: string | number | null; error: ErrorBody } {
  const idAt = header.indexOf("id");
  const rawId = idAt >= 0 ? (cells[idAt] ?? "") : "";
  const id = rawId === "" ? null : /^\d{1,15}$/.test(rawId) ? Number(rawId) : rawId;
  if (cells.length !== header.length) {
    return {
      id,
      error: { code: "malformed-line", message: `expected ${header.length} cells, found ${cells.length}`, issues: [] },
    };
  }
  const procAt = header.indexOf("procedure");
  const proc = procAt >= 0 && cells[procAt] !== "" ? cells[procAt] : procedure;
  const { value: input, problems } = cellsToObject(header, cells, BATCH_COLUMNS);
  const first = problems[0];
  if (first !== undefined)
    return {
      id,
      error: {
        code: "malformed-line",
        message: `column "${first.column}": ${first.message}`,
        issues: [{ path: first.path, message: first.message }],
      },
    };
  if (proc === undefined)
    return {
      id,
      error: {
        code: "malformed-line",
        message: "no procedure: add a procedure column or pass --procedure",
        issues: [],
      },
    };
  return { raw: JSON.stringify({ ...(id === null ? {} : { id }), procedure: proc, input }) };
}

/**
 * Why a CSV header cannot be read as batch lines, or undefined: with no procedure column and no
 * --procedure no row can name its procedure, so the file is refused before any row.
 */
export function csvHeaderProblem(header: readonly string[], procedure: string | undefined): string | undefined {
  if (procedure === undefined && !header.includes("procedure")) {
    return `the CSV header has no "procedure" column and no --procedure was given: add a procedure column (e.g. procedure,id,supplyV,...) or pass --procedure operatingPoint`;
  }
  return undefined;
}

type Json = { [k: string]: unknown };

/** Leaf paths of a JSON Schema (objects flattened with dots; unions merged in order of appearance). */
function leaves(schema: Json, prefix: string, out: string[]): void {
  const branches = (schema.oneOf ?? schema.anyOf) as Json[] | undefined;
  if (branches) {
    for (const b of branches) leaves(b, prefix, out);
    return;
  }
  if (schema.type === "object" && schema.properties) {
    for (const [k, v] of Object.entries(schema.properties as Json))
      leaves(v as Json, prefix ? `${prefix}.${k}` : k, out);
    return;
  }
  if (prefix && !out.includes(prefix)) out.push(prefix);
}

export const BASE_COLUMNS = ["line", "id", "ok", "error.code", "error.message", "error.issues"] as const;

/**
 * CSV result columns, derived from the output contracts of the procedures given (in the procedure
 * table's order, whatever the order given; undefined: of every procedure).
 */
export function resultColumns(procedures: readonly string[] | undefined): string[] {
  const out: string[] = [];
  for (const e of procedureEntries()) {
    if (procedures !== undefined && !procedures.includes(e.path)) continue;
    if (e.output === undefined) {
      if (!out.includes("result")) out.push("result");
      continue;
    }
    leaves(z.toJSONSchema(e.output, { io: "output", unrepresentable: "any" }) as Json, "", out);
  }
  return out.map((c) => ((BASE_COLUMNS as readonly string[]).includes(c) ? `result.${c}` : c));
}

function at(obj: unknown, dotted: string): unknown {
  let node = obj;
  for (const p of dotted.split(".")) {
    if (typeof node !== "object" || node === null) return undefined;
    node = (node as Record<string, unknown>)[p];
  }
  return node;
}

const cell = (v: unknown): string =>
  v === undefined || v === null ? "" : typeof v === "object" ? JSON.stringify(v) : String(v);

/** The output writer of a batch run: JSON Lines, or CSV with a header derived from the contracts of `procedures`. */
export function outputFormatter(
  format: Format,
  procedures: readonly string[] | undefined,
): { header: string; line: (o: BatchOutputLine) => string } {
  if (format === "jsonl") return { header: "", line: (o) => `${JSON.stringify(o)}\n` };
  const cols = resultColumns(procedures);
  const header = stringify([[...BASE_COLUMNS, ...cols]]);
  return {
    header,
    line: (o) => {
      const base = [
        o.line,
        cell(o.id),
        o.ok ? "true" : "false",
        o.ok ? "" : o.error.code,
        o.ok ? "" : o.error.message,
        o.ok ? "" : JSON.stringify(o.error.issues),
      ];
      const rest = cols.map((c) =>
        o.ok ? cell(c === "result" ? o.result : at(o.result, c.startsWith("result.") ? c.slice(7) : c)) : "",
      );
      return stringify([[...base, ...rest]]);
    },
  };
}
