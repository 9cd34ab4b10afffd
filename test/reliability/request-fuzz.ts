import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { projectRoot } from "../../adapters/project-root.js";

/** The example request of every procedure (examples/requests/*.json), by procedure. */
export function exampleInputs(): Map<string, unknown> {
  const dir = join(projectRoot(), "examples", "requests");
  const out = new Map<string, unknown>();
  for (const f of readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .sort()) {
    const c = JSON.parse(readFileSync(join(dir, f), "utf8")) as { procedure: string; input: unknown };
    out.set(c.procedure, c.input);
  }
  return out;
}

type Path = (string | number)[];

/** Every property name anywhere in a JSON Schema (what an input may hold as a key). */
export function schemaKeys(schema: unknown, out = new Set<string>()): Set<string> {
  if (Array.isArray(schema)) for (const s of schema) schemaKeys(s, out);
  else if (typeof schema === "object" && schema !== null) {
    for (const [k, v] of Object.entries(schema)) {
      if (k === "properties" && typeof v === "object" && v !== null) for (const name of Object.keys(v)) out.add(name);
      schemaKeys(v, out);
    }
  }
  return out;
}

/** Whether a JSON text holds, anywhere, an object key outside `known` (false for text that is not JSON). */
export function hasUnknownKey(body: string, known: ReadonlySet<string>): boolean {
  let v: unknown;
  try {
    v = JSON.parse(body);
  } catch {
    return false;
  }
  const todo: unknown[] = [v]; // iterative: the deep-nesting mutation nests 10,000 levels
  while (todo.length > 0) {
    const x = todo.pop();
    if (Array.isArray(x)) todo.push(...x);
    else if (typeof x === "object" && x !== null) {
      for (const [k, y] of Object.entries(x)) {
        if (!known.has(k)) return true;
        todo.push(y);
      }
    }
  }
  return false;
}

/** Every path to a node of `v` (the root excluded), depth first, in key order. */
export function pathsOf(v: unknown, at: Path = []): Path[] {
  const out: Path[] = [];
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i += 1) out.push([...at, i], ...pathsOf(v[i], [...at, i]));
  } else if (typeof v === "object" && v !== null)
    for (const [k, x] of Object.entries(v)) out.push([...at, k], ...pathsOf(x, [...at, k]));
  return out;
}

export const MUTATIONS = [
  "type",
  "sign",
  "magnitude",
  "wrong-unit",
  "missing",
  "extra",
  "huge-string",
  "deep-nesting",
] as const;
export type Mutation = (typeof MUTATIONS)[number];

const DEEP = "__fuzz_deep_nesting__";
const DEPTH = 10_000;
const typeSwaps = [null, true, "text", 7, [], {}, [1, 2], { kind: "nothing" }];
const magnitudes = [1e300, -1e300, 1e-300, 0, Number.MAX_VALUE, 5e15, -0, 2 ** 53 + 1];
const wrongUnits = [
  "3 kg",
  "5 m/s",
  "2 V",
  "1 A",
  "4 s",
  "7 degC",
  "12 ohm",
  "1 J",
  "2 K/W",
  "banana",
  "1e999 V",
  "NaN V",
  "-Infinity A",
  "",
];

/** A mutation of one node, as an arbitrary: the kind, the node index and the replacement picks. */
export const mutationArb = fc.record({ kind: fc.constantFrom(...MUTATIONS), node: fc.nat(), pick: fc.nat() });

function getAt(v: unknown, p: Path): unknown {
  let x = v;
  for (const k of p) x = (x as Record<string | number, unknown>)[k];
  return x;
}

/** The JSON text of `input` with one node mutated as `m` says. */
export function mutatedBody(input: unknown, m: { kind: Mutation; node: number; pick: number }): string {
  const copy = structuredClone(input) as Record<string, unknown>;
  const paths = pathsOf(copy);
  if (paths.length === 0) return JSON.stringify(copy);
  const path = paths[m.node % paths.length] as Path;
  const parent = getAt(copy, path.slice(0, -1)) as Record<string | number, unknown> | unknown[];
  const key = path.at(-1) as string | number;
  const old = (parent as Record<string | number, unknown>)[key];
  const set = (v: unknown) => {
    (parent as Record<string | number, unknown>)[key] = v;
  };
  const pick = <T>(xs: readonly T[]): T => xs[m.pick % xs.length] as T;
  switch (m.kind) {
    case "type":
      set(pick(typeSwaps.filter((t) => typeof t !== typeof old || Array.isArray(t) !== Array.isArray(old))));
      break;
    case "sign":
      if (typeof old === "number") set(old === 0 ? -1 : -old);
      else if (typeof old === "string") set(`-${old}`);
      else set(-1);
      break;
    case "magnitude": {
      const x = pick(magnitudes);
      set(typeof old === "string" && /\d/.test(old) ? old.replace(/^-?[\d.]+(e-?\d+)?/i, String(x)) : x);
      break;
    }
    case "wrong-unit":
      set(pick(wrongUnits));
      break;
    case "missing":
      if (Array.isArray(parent)) parent.splice(key as number, 1);
      else delete (parent as Record<string, unknown>)[key as string];
      break;
    case "extra":
      if (typeof old === "object" && old !== null && !Array.isArray(old))
        (old as Record<string, unknown>).unexpectedField = pick([1, "x", null, { a: 1 }]);
      else copy.unexpectedField = 1;
      break;
    case "huge-string":
      set(pick(["x".repeat(200_000), `${"1".repeat(100_000)} V`, "\u0000".repeat(10_000), "😀".repeat(50_000)]));
      break;
    case "deep-nesting":
      set(DEEP);
      break;
  }
  const text = JSON.stringify(copy);
  const nested = pick([`${"[".repeat(DEPTH)}${"]".repeat(DEPTH)}`, `${'{"a":'.repeat(DEPTH)}1${"}".repeat(DEPTH)}`]);
  return text.replace(`"${DEEP}"`, nested);
}

/** Families that bound resources (issue 22): nesting depth, width (many items or keys) and size, each at one node of an example. */
export const RESOURCE_MUTATIONS = [
  "depth-over-limit",
  "deep-array",
  "deep-object",
  "wide-array",
  "wide-object",
  "big-string",
] as const;
export type ResourceMutation = (typeof RESOURCE_MUTATIONS)[number];

const WIDE = "__fuzz_wide__";

/** The JSON text of `input` with one node replaced as `kind` says (the node picked by `node`). */
export function resourceBody(input: unknown, kind: ResourceMutation, node: number, depthLimit: number): string {
  const copy = structuredClone(input) as Record<string, unknown>;
  const paths = pathsOf(copy);
  if (paths.length === 0) return JSON.stringify(copy);
  const path = paths[node % paths.length] as Path;
  const parent = getAt(copy, path.slice(0, -1)) as Record<string | number, unknown>;
  const key = path.at(-1) as string | number;
  const old = parent[key];
  parent[key] = WIDE;
  const text = JSON.stringify(copy);
  const oldText = JSON.stringify(old) ?? "null";
  const replacement: Record<ResourceMutation, () => string> = {
    // just past the limit, counted from this node's own depth: the input as a whole is over it
    "depth-over-limit": () => `${"[".repeat(depthLimit + 1)}${"]".repeat(depthLimit + 1)}`,
    "deep-array": () => `${"[".repeat(DEPTH)}${"]".repeat(DEPTH)}`,
    "deep-object": () => `${'{"a":'.repeat(DEPTH)}1${"}".repeat(DEPTH)}`,
    "wide-array": () => `[${Array.from({ length: 5000 }, () => oldText).join(",")}]`,
    "wide-object": () => `{${Array.from({ length: 5000 }, (_, i) => `"k${i}":${oldText}`).join(",")}}`,
    "big-string": () => JSON.stringify("9".repeat(6_000_000)),
  };
  return text.replace(`"${WIDE}"`, replacement[kind]());
}
