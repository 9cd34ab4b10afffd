import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { START_PROFILES } from "../../domain/checks/start-profiles.js";
import { SUPPLY_CLASSES } from "../../domain/review/supply-classes.js";
import { TRANSIENT_LIBRARY } from "../../domain/review/transient-library.js";

// Every number of the built-in libraries (supply classes, pulses, starting profiles) is listed in
// docs/references.md, section "Built-in values", with the same value and how sure it is: [S] with
// the clause and where it was read, [M] (memory) with what would confirm it, [C] or common practice.
// A value changed in the code without its row, a row whose value differs from the code, or a row
// that names no built-in entry fails here.

interface Row {
  readonly line: number;
  readonly entries: readonly string[];
  readonly values: ReadonlyMap<string, { readonly value: number; readonly eitherSign: boolean }>;
  readonly status: string;
  readonly where: string;
}

const STATUSES = ["S", "M", "C", "common practice"];

function parseBuiltInValues(markdown: string): Row[] {
  const lines = markdown.split("\n");
  const start = lines.findIndex((l) => l.startsWith("## Built-in values"));
  if (start < 0) throw new Error('docs/references.md has no "## Built-in values" section');
  const rows: Row[] = [];
  for (let i = start + 1; i < lines.length; i += 1) {
    const l = lines[i] ?? "";
    if (l.startsWith("## ")) break;
    if (!l.startsWith("|") || l.startsWith("|---") || l.startsWith("| entries")) continue;
    const cells = l
      .split("|")
      .slice(1, -1)
      .map((c) => c.trim());
    const [entries = "", values = "", status = "", where = ""] = cells;
    const map = new Map<string, { value: number; eitherSign: boolean }>();
    for (const pair of values.split(",").map((p) => p.trim())) {
      const m = /^([A-Za-z0-9.]+)=(±)?(-?[0-9.e+-]+)$/.exec(pair);
      if (m === null) throw new Error(`docs/references.md line ${i + 1}: "${pair}" is not field=value`);
      map.set(m[1] ?? "", { value: Number(m[3]), eitherSign: m[2] === "±" });
    }
    rows.push({
      line: i + 1,
      entries: entries.split(",").map((e) => e.trim().replaceAll("`", "")),
      values: map,
      status,
      where,
    });
  }
  return rows;
}

/** Every number of a library entry, by its field path (arrays by index: sweep.decayS.0). */
function numericFields(entry: object, prefix = ""): [string, number][] {
  const out: [string, number][] = [];
  for (const [key, v] of Object.entries(entry)) {
    const path = prefix === "" ? key : `${prefix}.${key}`;
    if (typeof v === "number") out.push([path, v]);
    else if (Array.isArray(v))
      out.push(...v.flatMap((x, i): [string, number][] => (typeof x === "number" ? [[`${path}.${i}`, x]] : [])));
    else if (v !== null && typeof v === "object") out.push(...numericFields(v, path));
  }
  return out;
}

const globMatch = (glob: string, id: string) =>
  new RegExp(
    `^${glob
      .replace(/[.+^${}()|[\]\\]/g, "\\$&")
      .replaceAll("*", ".*")
      .replaceAll("?", ".")}$`,
  ).test(id);

/** The problems of a library against the rows: unlisted values, differing values, rows of no entry, bad status. */
function referenceProblems(library: readonly { id: string }[], rows: readonly Row[]): string[] {
  const problems: string[] = [];
  for (const r of rows) {
    if (!STATUSES.includes(r.status)) problems.push(`line ${r.line}: status "${r.status}" is not one of ${STATUSES}`);
    if (r.status === "M" && !/confirm/i.test(r.where))
      problems.push(`line ${r.line}: a memory value says what would confirm it`);
    if (r.status === "S" && !/(clause|table|figure|annex|https?:\/\/)/i.test(r.where))
      problems.push(`line ${r.line}: a published value names its clause or where it was read`);
  }
  for (const entry of library) {
    for (const [field, value] of numericFields(entry)) {
      const listing = rows.filter((r) => r.entries.some((g) => globMatch(g, entry.id)) && r.values.has(field));
      if (listing.length === 0) problems.push(`${entry.id} ${field} = ${value} is not listed`);
      for (const r of listing) {
        const v = r.values.get(field);
        const same = v !== undefined && (v.eitherSign ? Math.abs(value) === v.value : value === v.value);
        if (!same)
          problems.push(
            `${entry.id} ${field} = ${value}, but line ${r.line} says ${v?.eitherSign ? "±" : ""}${v?.value}`,
          );
      }
    }
  }
  return problems;
}

const rows = parseBuiltInValues(readFileSync(join(projectRoot(), "docs", "references.md"), "utf8"));
const LIBRARIES = { supply: SUPPLY_CLASSES, transients: TRANSIENT_LIBRARY, startProfiles: START_PROFILES };
const all = [...SUPPLY_CLASSES, ...TRANSIENT_LIBRARY, ...START_PROFILES];

describe("docs/references.md lists every built-in value with its source or its memory mark", () => {
  for (const [name, library] of Object.entries(LIBRARIES)) {
    it(`${name}: every number is listed with the code's value`, () => {
      expect(referenceProblems(library, rows)).toEqual([]);
    });
  }

  it("every row names at least one built-in entry, and each of its fields exists there", () => {
    const stale = rows.flatMap((r) => {
      const matched = all.filter((e) => r.entries.some((g) => globMatch(g, e.id)));
      if (matched.length === 0) return [`line ${r.line}: names no built-in entry (${r.entries.join(", ")})`];
      const fields = new Set(matched.flatMap((e) => numericFields(e).map(([f]) => f)));
      return [...r.values.keys()].filter((f) => !fields.has(f)).map((f) => `line ${r.line}: no entry has ${f}`);
    });
    expect(stale).toEqual([]);
  });

  it("the checker catches a value changed in the code, an unlisted one and a memory row without its confirmation", () => {
    const doctored = [{ id: "iso7637-2-pulse-1-12v", amplitudeV: -100, extraV: 3 }];
    const got = referenceProblems(doctored, rows);
    expect(got.some((p) => p.includes("amplitudeV = -100, but line"))).toBe(true);
    expect(got).toContain("iso7637-2-pulse-1-12v extraV = 3 is not listed");
    const bare = parseBuiltInValues(
      "## Built-in values\n\n| entries | values | status | where |\n|---|---|---|---|\n| `x` | a=1 | M | from experience |\n",
    );
    expect(referenceProblems([{ id: "x" }], bare)).toEqual(["line 5: a memory value says what would confirm it"]);
  });
});
