import { describe, expect, it } from "vitest";
import { z } from "zod";
import { procedureEntry, procedureInvoker } from "../../api/procedure-registry.js";
import { demoContext } from "../helpers/app.js";
import { exampleInputs, pathsOf } from "../reliability/request-fuzz.js";

/**
 * Every default applied is declared: for each procedure, each optional input of its example whose
 * contract says it has a default ("(default ...)" in its description) is omitted in turn, and the
 * answer must then list an assumption it did not list before, naming the field and its value (or
 * be refused as "required" where the model cannot do without it in that case).
 */
type Json = { [k: string]: unknown };

/** The description of the property at `path` in a JSON Schema (following $ref, unions and arrays). */
function descriptionAt(root: Json, node: Json, path: readonly (string | number)[]): string | undefined {
  let n = node;
  while (typeof n.$ref === "string") n = ((root.$defs as Json)[n.$ref.replace("#/$defs/", "")] as Json) ?? {};
  if (path.length === 0) return typeof n.description === "string" ? n.description : undefined;
  const [head, ...rest] = path;
  for (const branch of [...((n.anyOf as Json[]) ?? []), ...((n.oneOf as Json[]) ?? [])]) {
    const d = descriptionAt(root, branch, path);
    if (d !== undefined) return d;
  }
  if (typeof head === "number") return n.items ? descriptionAt(root, n.items as Json, rest) : undefined;
  const prop = (n.properties as Json | undefined)?.[head as string] as Json | undefined;
  return prop ? descriptionAt(root, prop, rest) : undefined;
}

const cases: [string, string, (string | number)[]][] = [];
for (const [procedure, input] of exampleInputs()) {
  const schema = procedureEntry(procedure)?.input;
  if (schema === undefined) continue;
  // an analysis declares its defaults in `assumptions`; a listing (catalog.list's page size) has none to declare
  const output = z.toJSONSchema(procedureEntry(procedure)?.output ?? z.never(), { unrepresentable: "any" }) as Json;
  if (!JSON.stringify(output).includes('"assumptions"')) continue;
  const json = z.toJSONSchema(schema, { io: "input", unrepresentable: "any" }) as Json;
  for (const p of pathsOf(input)) {
    if (typeof p.at(-1) === "number") continue;
    const d = descriptionAt(json, json, p);
    if (d !== undefined && /\(default[ :]/.test(d)) cases.push([procedure, p.join("."), p]);
  }
}

describe("omitting an input with a default adds the default to assumptions", () => {
  const invoker = procedureInvoker(demoContext());
  it("walks at least 10 such inputs", () => {
    expect(cases.length).toBeGreaterThanOrEqual(10);
  });
  it.each(cases)("%s: %s", async (procedure, _name, path) => {
    const call = invoker(procedure);
    if (call === undefined) throw new Error(procedure);
    const input = exampleInputs().get(procedure);
    const before = new Set(((await call(input)) as { assumptions: string[] }).assumptions);
    const copy = structuredClone(input) as Json;
    let parent = copy;
    for (const k of path.slice(0, -1)) parent = parent[k] as Json;
    delete parent[path.at(-1) as string];
    let after: string[];
    try {
      after = ((await call(copy)) as { assumptions: string[] }).assumptions;
    } catch (e) {
      // no default where the model cannot do without the value: refused, naming it (not a silent default)
      expect(JSON.stringify(e)).toMatch(new RegExp(`required|${String(path.at(-1))}`));
      return;
    }
    const added = after.filter((a) => !before.has(a));
    const field = String(path.at(-1));
    expect(
      added.find((a) => a.includes(field)),
      `${procedure} without ${path.join(".")}: new assumptions ${JSON.stringify(added)}`,
    ).toBeDefined();
  });
});
