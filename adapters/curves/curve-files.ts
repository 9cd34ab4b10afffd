import { readFileSync, realpathSync, statSync } from "node:fs";
import { isAbsolute, relative, resolve, sep } from "node:path";
import { parse } from "csv-parse/sync";
import type { z } from "zod";
import { CURVE_POINT_FORMS, headerOf } from "../../contracts/curve-points.js";
import { LIMITS, limitMessage } from "../../contracts/limits.js";
import { issuesOf } from "../../contracts/zod-messages.js";

/**
 * Curve files: in a batch input file or a parts catalog file, a curve's points may be a reference
 * `{ "csv": "curves/vf-5a.csv" }` to a CSV file, resolved relative to the referencing file's folder.
 * This is the one place such files are read: a raw-JSON transform, run before the contract parses
 * the value, that puts each file's points in the reference's place (contracts/curve-points.ts
 * refuses a reference that reaches a contract unresolved, as over HTTP).
 *
 * The file: a header row naming the fields of one curve's point, in any order (the fields carry
 * their units: `currentA,voltageV,tempC`, `tjC,rdsOnOhm`, `timeS,zthKPerW`, ...; an optional field
 * may be left out), then one row a point. A cell is a number, a quantity with its unit ("5 mA"), or
 * empty (the field is absent, as an optional tempC). Blank lines are skipped; rows are reported by
 * their line in the file, cells by their column's name, each checked by the point's own contract.
 *
 * Bounded: the path must be relative, end in .csv and stay inside `root` (no `..` or symbolic link
 * out of it), the file at most BACKSTOP_MAX_CURVE_FILE_BYTES; at most BACKSTOP_MAX_ERROR_ISSUES
 * problems are listed.
 */
export interface CurveFileScope {
  /** The folder of the referencing file: a reference's path is relative to it. */
  readonly baseDir: string;
  /** No file outside this folder is read (the batch input's or the catalog's folder). */
  readonly root: string;
}

export interface CurveFileProblem {
  /** Where the reference is in the raw value. */
  readonly path: (string | number)[];
  readonly message: string;
  /** The file is over the size limit (an error body's `limit-exceeded`). */
  readonly limit?: true;
}

export type CurveFileResult =
  | { readonly ok: true; readonly value: unknown; readonly files: number }
  | { readonly ok: false; readonly problems: readonly CurveFileProblem[] };

/** Is `v` a curve file reference: an object whose one key is `csv`, a string? */
export function isCurveFileReference(v: unknown): v is { csv: string } {
  if (typeof v !== "object" || v === null || Array.isArray(v)) return false;
  const keys = Object.keys(v);
  return keys.length === 1 && keys[0] === "csv" && typeof (v as { csv: unknown }).csv === "string";
}

type Read = { points: Record<string, unknown>[] } | { problems: string[]; limit?: true };

/** `raw` with every curve file reference replaced by the file's points, or the problems found. */
export function resolveCurveFiles(raw: unknown, scope: CurveFileScope): CurveFileResult {
  const cache = new Map<string, Read>();
  const problems: CurveFileProblem[] = [];
  let files = 0;
  // Depth is bounded before anything reads an input (maxInputDepth); past it nothing is resolved.
  const walk = (v: unknown, path: (string | number)[]): unknown => {
    if (typeof v !== "object" || v === null || path.length > LIMITS.maxInputDepth) return v;
    if (isCurveFileReference(v)) {
      const read = cache.get(v.csv) ?? readCurveFile(v.csv, scope);
      cache.set(v.csv, read);
      if ("points" in read) {
        files += 1;
        return read.points;
      }
      for (const message of read.problems) problems.push({ path, message, ...(read.limit ? { limit: true } : {}) });
      return v;
    }
    if (Array.isArray(v)) return v.map((x, i) => walk(x, [...path, i]));
    // own data properties, so a "__proto__" member stays a member the contract refuses by name
    // (an assignment would set the copy's prototype instead)
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v))
      Object.defineProperty(out, k, {
        value: walk(x, [...path, k]),
        enumerable: true,
        writable: true,
        configurable: true,
      });
    return out;
  };
  const value = walk(raw, []);
  if (problems.length > 0) return { ok: false, problems: problems.slice(0, LIMITS.maxErrorIssues) };
  return { ok: true, value, files };
}

/** The file's path inside the root, or why it is refused. */
function placeOf(name: string, scope: CurveFileScope): { file: string } | { refused: string } {
  if (name === "" || isAbsolute(name) || /^[A-Za-z]:/.test(name) || name.includes("\\"))
    return { refused: `"${name}": give a path relative to the referencing file's folder, with / between folders` };
  if (!name.toLowerCase().endsWith(".csv")) return { refused: `"${name}": a curve file's name ends in .csv` };
  const root = resolve(scope.root);
  const file = resolve(scope.baseDir, name);
  const outside = (p: string, r: string) => {
    const rel = relative(r, p);
    return rel === "" || rel.startsWith(`..${sep}`) || rel === ".." || isAbsolute(rel);
  };
  if (outside(file, root)) return { refused: `"${name}" leaves the folder curve files are read from (${root})` };
  let real: string;
  try {
    real = realpathSync(file);
  } catch {
    return { refused: `"${name}": no such file (looked for ${file})` };
  }
  if (outside(real, realpathSync(root)))
    return { refused: `"${name}" is a link out of the folder curve files are read from (${root})` };
  return { file: real };
}

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

function readCurveFile(name: string, scope: CurveFileScope): Read {
  const place = placeOf(name, scope);
  if ("refused" in place) return { problems: [`curve file ${place.refused}`] };
  const stat = statSync(place.file);
  if (!stat.isFile()) return { problems: [`curve file "${name}" is not a file`] };
  const size = stat.size;
  if (size > LIMITS.maxCurveFileBytes)
    return { problems: [limitMessage("maxCurveFileBytes", `curve file "${name}" is ${size} bytes`)], limit: true };
  let rows: { info: { lines: number }; record: string[] }[];
  try {
    rows = parse(readFileSync(place.file, "utf8"), {
      bom: true,
      info: true,
      trim: true,
      skip_empty_lines: true,
      relax_column_count: true,
    }) as unknown as typeof rows;
  } catch (e) {
    return { problems: [`curve file "${name}": not CSV: ${(e as Error).message}`] };
  }
  const [head, ...body] = rows;
  if (head === undefined || body.length === 0)
    return { problems: [`curve file "${name}": a header row and one row a point are needed`] };
  const header = head.record;
  const form = CURVE_POINT_FORMS.find((f) => {
    const fields = Object.entries(f.point.shape);
    const required = fields.filter(([, s]) => !(s as z.ZodType).safeParse(undefined).success).map(([k]) => k);
    return header.every((h) => fields.some(([k]) => k === h)) && required.every((k) => header.includes(k));
  });
  const twin = header.find((h, i) => header.indexOf(h) !== i);
  if (twin !== undefined) return { problems: [`curve file "${name}" line ${head.info.lines}: column ${twin} twice`] };
  if (form === undefined) {
    const known = CURVE_POINT_FORMS.map((f) => `${headerOf(f.point)} (${f.curve})`).join("; ");
    return {
      problems: [
        `curve file "${name}" line ${head.info.lines}: the header ${header.join(",")} names no curve's columns; a header names the fields of one curve's point: ${known}`,
      ],
    };
  }
  const problems: string[] = [];
  const points: Record<string, unknown>[] = [];
  for (const { info, record } of body) {
    if (problems.length >= LIMITS.maxErrorIssues) break;
    const at = `curve file "${name}" line ${info.lines}`;
    if (record.length !== header.length) {
      problems.push(`${at}: ${record.length} cells, the header has ${header.length} (${header.join(",")})`);
      continue;
    }
    const point: Record<string, unknown> = {};
    header.forEach((h, i) => {
      const cell = record[i] ?? "";
      if (cell !== "") point[h] = NUMBER.test(cell) ? Number(cell) : cell;
    });
    const parsed = form.point.safeParse(point);
    if (!parsed.success) {
      for (const issue of issuesOf(parsed.error.issues)) {
        const column = issue.path[0];
        const cell = typeof column === "string" ? record[header.indexOf(column)] : undefined;
        problems.push(
          `${at}, column ${String(column ?? "?")}${cell === undefined || cell === "" ? "" : ` ("${cell}")`}: ${issue.message}`,
        );
      }
      continue;
    }
    points.push(point);
  }
  return problems.length > 0 ? { problems } : { points };
}
