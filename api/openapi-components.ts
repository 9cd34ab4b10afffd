import { z } from "zod";
import { pascalName, sharedSchemaNames } from "../contracts/schema-names.js";

type Json = { [k: string]: unknown };

const PREFIX = "#/components/schemas/";
const SCHEMA_MAPS = new Set(["properties", "patternProperties", "$defs", "definitions", "dependentSchemas"]);
const SCHEMA_ONE = new Set([
  "items",
  "additionalProperties",
  "not",
  "if",
  "then",
  "else",
  "contains",
  "propertyNames",
  "unevaluatedItems",
  "unevaluatedProperties",
]);
const SCHEMA_LIST = new Set(["anyOf", "oneOf", "allOf", "prefixItems"]);
const BOUND_KEYWORD = { gt: "exclusiveMinimum", ge: "minimum", lt: "exclusiveMaximum", le: "maximum" } as const;

/**
 * Make zod's JSON Schema a clean OpenAPI 3.1 schema: the `unit` of a quantity becomes the extension
 * `x-unit`, and its bounds (gt/ge/lt/le in the field's unit) become the standard keywords on the
 * number branch (an answer's quantity is a number). Works on a fresh copy; the zod schemas are never touched. `named` holds the
 * components of the same side: a quantity that refers to a named one is written out, so its bounds
 * land on its own number branch.
 */
function tidy(node: unknown, named: Json): unknown {
  if (Array.isArray(node)) return node.map((n) => tidy(n, named));
  if (typeof node !== "object" || node === null) return node;
  let src = node as Json;
  const target = typeof src.$ref === "string" ? named[src.$ref.slice(PREFIX.length)] : undefined;
  if (typeof src.unit === "string" && target !== undefined) {
    const { $ref: _drop, ...rest } = src;
    src = { ...(target as Json), ...rest };
  }
  const out: Json = {};
  for (const [k, v] of Object.entries(src)) {
    if (k === "$schema" || k === "$id") continue;
    if (SCHEMA_MAPS.has(k) && typeof v === "object" && v !== null)
      out[k] = Object.fromEntries(Object.entries(v as Json).map(([name, s]) => [name, tidy(s, named)]));
    else if (SCHEMA_ONE.has(k) || SCHEMA_LIST.has(k)) out[k] = tidy(v, named);
    else if (k === "unit" && typeof v === "string") out["x-unit"] = v;
    else if (k in BOUND_KEYWORD && typeof v === "number") continue;
    else out[k] = v;
  }
  // an answer's quantity: zod cannot describe a transform's output, and a quantity's is always a number
  const shaped = ["type", "anyOf", "oneOf", "allOf", "$ref", "const", "enum"].some((k) => k in out);
  if (typeof src.unit === "string" && !shaped) out.type = "number";
  const bounds = Object.entries(BOUND_KEYWORD).filter(([k]) => typeof src[k] === "number");
  if (bounds.length > 0) {
    const numberBranch = Array.isArray(out.anyOf)
      ? (out.anyOf as Json[]).find((b) => b.type === "number")
      : out.type === "number"
        ? out
        : undefined;
    if (numberBranch) for (const [k, keyword] of bounds) numberBranch[keyword] = src[k];
    else out["x-bounds"] = Object.fromEntries(bounds.map(([k]) => [k, src[k]]));
  }
  return out;
}

/** The component names a schema refers to. */
const refsOf = (text: string): string[] =>
  [...text.matchAll(/"#\/components\/schemas\/([^"]+)"/g)].map((m) => m[1] as string);

/** The names reachable from `roots` through `$ref`s. */
function reachable(roots: readonly string[], texts: ReadonlyMap<string, string>): Set<string> {
  const seen = new Set<string>();
  const todo = [...roots];
  for (let name = todo.pop(); name !== undefined; name = todo.pop()) {
    if (seen.has(name)) continue;
    seen.add(name);
    todo.push(...refsOf(texts.get(name) ?? ""));
  }
  return seen;
}

/** One side (what a request may hold, or what an answer holds) of every registered schema, tidied, as JSON text by id. */
function side(registry: z.core.$ZodRegistry<{ id: string }>, io: "input" | "output"): Map<string, string> {
  const { schemas } = z.toJSONSchema(registry, {
    io,
    target: "draft-2020-12",
    unrepresentable: "any",
    reused: "inline",
    cycles: "ref",
    uri: (id) => `${PREFIX}${id}`,
  });
  if ("__shared" in schemas)
    throw new Error(
      "a schema without a name is used in a cycle: export it from its contract module (contracts/schema-names.ts)",
    );
  const out = new Map<string, string>();
  for (const [id, s] of Object.entries(schemas)) out.set(id, JSON.stringify(tidy(s, schemas as Json)));
  return out;
}

export interface ProcedureSchemas {
  readonly path: string;
  readonly input: z.ZodType;
  readonly output: z.ZodType;
}

export interface Components {
  /** every component, by name, in a stable order */
  readonly schemas: Json;
  /** the component of a procedure's input (what a request holds) */
  readonly inputOf: (path: string) => string;
  /** the component of a procedure's answer */
  readonly outputOf: (path: string) => string;
  /** the component of one of the `answers` schemas */
  readonly answerOf: (schema: z.ZodType) => string;
}

/**
 * The named components of the procedures' contracts: each procedure's input and output
 * (`<Procedure>Input`, `<Procedure>Output`) and every exported contract schema it uses
 * (contracts/schema-names.ts), referred to by `$ref` wherever it appears. A schema whose request
 * side differs from its answer side (a quantity is a number or a string with a unit in a request,
 * a number in an answer; a default makes a field optional in a request only) is two components:
 * the request's under its name, the answer's under `<Name>Result` (`<Name>Answer` where that name is
 * taken); one that reads the same on both
 * sides is one.
 */
export function contractComponents(procedures: readonly ProcedureSchemas[], answers: readonly z.ZodType[]): Components {
  const registry = z.registry<{ id: string }>();
  const used = new Set<string>();
  const add = (schema: z.ZodType, id: string): string => {
    const known = registry.get(schema)?.id;
    if (known !== undefined) return known;
    if (used.has(id)) throw new Error(`two different schemas are both named ${id} in the OpenAPI document`);
    registry.add(schema, { id });
    used.add(id);
    return id;
  };
  const roots = procedures.map((p) => ({
    path: p.path,
    input: add(p.input, `${pascalName(p.path)}Input`),
    output: add(p.output, `${pascalName(p.path)}Output`),
  }));
  for (const [schema, id] of sharedSchemaNames()) if (!used.has(id)) add(schema, id);
  const answerRoots = answers.map((s) => {
    const id = registry.get(s)?.id;
    if (id === undefined) throw new Error("an answer schema of the document is not exported from contracts/");
    return id;
  });

  const input = side(registry, "input");
  const output = side(registry, "output");
  const asked = reachable(
    roots.map((r) => r.input),
    input,
  );
  const answered = reachable([...roots.map((r) => r.output), ...answerRoots], output);
  // two components where the sides differ, and where a part they refer to does
  const split = new Set([...answered].filter((id) => asked.has(id) && input.get(id) !== output.get(id)));
  for (let grew = true; grew; ) {
    grew = false;
    for (const id of answered)
      if (asked.has(id) && !split.has(id) && refsOf(output.get(id) ?? "").some((r) => split.has(r))) {
        split.add(id);
        grew = true;
      }
  }
  // `<Name>Result`, or `<Name>Answer` where a contract already exports a `<name>Result`
  const answerNames = new Map<string, string>();
  for (const id of split) {
    const name = [`${id}Result`, `${id}Answer`].find((n) => !used.has(n));
    if (name === undefined) throw new Error(`${id}Result and ${id}Answer both name other schemas`);
    answerNames.set(id, name);
    used.add(name);
  }
  const answerName = (id: string) => answerNames.get(id) ?? id;
  const schemas: Json = {};
  for (const id of [...asked].sort()) schemas[id] = JSON.parse(input.get(id) ?? "{}");
  for (const id of [...answered].sort()) {
    if (asked.has(id) && !split.has(id)) continue;
    const text = (output.get(id) ?? "{}").replace(
      /"#\/components\/schemas\/([^"]+)"/g,
      (_m, r: string) => `"${PREFIX}${answerName(r)}"`,
    );
    schemas[answerName(id)] = JSON.parse(text);
  }
  const sorted = Object.fromEntries(Object.entries(schemas).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
  const byPath = new Map(roots.map((r) => [r.path, r]));
  return {
    schemas: sorted,
    inputOf: (path) => byPath.get(path)?.input ?? "",
    outputOf: (path) => answerName(byPath.get(path)?.output ?? ""),
    answerOf: (schema) => answerName(registry.get(schema)?.id ?? ""),
  };
}
