import { readFileSync } from "node:fs";
import { join } from "node:path";
import { Validator } from "@seriousme/openapi-schema-validator";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { committedOpenApiText, serviceOpenApi, servedOpenApiText } from "../../adapters/openapi/document.js";
import { requestExamples } from "../../adapters/openapi/request-examples.js";
import { procedureEntries } from "../../api/procedure-registry.js";
import { testApp } from "../helpers/app.js";

const committedFile = join(projectRoot(), "contracts", "openapi.json");

describe("OpenAPI 3.1 document", () => {
  it("is a valid OpenAPI 3.1 document (checked by an OpenAPI schema validator)", async () => {
    const v = new Validator();
    const res = await v.validate(serviceOpenApi());
    expect(res.errors ?? []).toEqual([]);
    expect(res.valid).toBe(true);
    expect(v.version).toBe("3.1");
    expect(
      (await new Validator().validate({ openapi: "3.1.0", paths: { "/x": { post: { responses: 5 } } } })).valid,
    ).toBe(false); // the validator can fail
  });

  it("has a /v1 path and a bulk path for every procedure of the table, with its input and output schema", () => {
    const doc = serviceOpenApi() as {
      paths: Record<string, unknown>;
      components: { schemas: Record<string, { description?: string }> };
    };
    for (const { path } of procedureEntries()) {
      expect(doc.paths[`/v1/${path}`], path).toBeDefined();
      expect(doc.paths[`/v1/${path}/bulk`], path).toBeDefined();
    }
    type S = {
      $ref?: string;
      properties?: Record<string, S>;
      anyOf?: S[];
      type?: string;
      exclusiveMinimum?: number;
      "x-unit"?: string;
    };
    const deref = (s: S | undefined): S | undefined =>
      s?.$ref ? deref(doc.components.schemas[s.$ref.replace("#/components/schemas/", "")] as S) : s;
    const supplyV = deref(deref(doc.components.schemas.OperatingPointInput as S)?.properties?.supplyV);
    expect(supplyV?.["x-unit"]).toBe("V");
    expect(supplyV?.anyOf?.find((b) => b.type === "number")?.exclusiveMinimum).toBe(0);
    const refs = JSON.stringify(doc).match(/"#\/components\/schemas\/[^"]+"/g) ?? [];
    for (const r of new Set(refs)) expect(doc.components.schemas[r.slice(22, -1)], r).toBeDefined(); // every $ref resolves
    expect(doc.components.schemas.OperatingPointOutput?.description).not.toBe("not declared in the contracts");
  });

  it("committed contracts/openapi.json matches the code", () => {
    let committed = "";
    try {
      committed = readFileSync(committedFile, "utf8");
    } catch {
      // absent: fall through to the failing comparison
    }
    if (committed !== committedOpenApiText()) {
      throw new Error(
        "contracts/openapi.json is out of date with the router and contracts: run `npm run openapi` and commit the result",
      );
    }
  });

  it("is served at /openapi.json as compact JSON, the same document as the committed file", async () => {
    const res = await testApp().app.request("/openapi.json");
    expect(res.status).toBe(200);
    const served = await res.text();
    expect(served).toBe(servedOpenApiText());
    expect(JSON.parse(served)).toEqual(JSON.parse(committedOpenApiText()));
  });

  it("names every component readably, once, and stays in the low hundreds of kB", () => {
    const doc = serviceOpenApi() as { components: Record<string, Record<string, unknown>> };
    const { schemas, responses, examples } = doc.components;
    const names = [schemas, responses, examples].flatMap((group) => Object.keys(group ?? {}));
    expect(names.length).toBeGreaterThan(50);
    // PascalCase words, no generated pieces: no "__schema", no "_", no digit-only suffix such as "Stage2"
    for (const name of names) expect(name, name).toMatch(/^([A-Z][a-z]*|[A-Z]+(?=[A-Z][a-z]|$))+$/);
    expect(new Set(names).size).toBe(names.length);
    const served = servedOpenApiText().length;
    // 748 kB compact (1.37 MB indented) before the components were named; the next test is the sharper guard
    expect(served).toBeLessThan(400_000);
    expect(served).toBeGreaterThan(50_000); // the bound can fail: the document is not empty
    expect(committedOpenApiText().length).toBeLessThan(800_000);
  });

  it("writes no object schema of 1 kB or more out twice: a shared part is one named component", () => {
    const doc = serviceOpenApi() as { paths: unknown; components: { schemas: Record<string, unknown> } };
    const seen = new Map<string, number>();
    const walk = (x: unknown, top: boolean): void => {
      if (Array.isArray(x)) {
        for (const y of x) walk(y, false);
        return;
      }
      if (x === null || typeof x !== "object") return;
      const o = x as Record<string, unknown>;
      if (!top && o.type === "object" && o.properties !== undefined) {
        const text = JSON.stringify(o);
        if (text.length >= 1000) seen.set(text, (seen.get(text) ?? 0) + 1);
      }
      for (const v of Object.values(o)) walk(v, false);
    };
    for (const s of Object.values(doc.components.schemas)) walk(s, true);
    walk(doc.paths, false);
    const repeated = [...seen].filter(([, n]) => n > 1).map(([text, n]) => `${n}× ${text.slice(0, 160)}`);
    expect(repeated, "name each in contracts/schema-names.ts (PARTS) or export it from its module").toEqual([]);
  });

  it("gives each operation with a body the example of its procedure, examples/requests/<procedure>.json", () => {
    const doc = serviceOpenApi() as {
      paths: Record<string, Record<string, { requestBody?: { content: Record<string, { examples?: object }> } }>>;
      components: { examples: Record<string, { value: unknown }> };
    };
    const examples = requestExamples();
    let operations = 0;
    for (const [path, ops] of Object.entries(doc.paths))
      for (const op of Object.values(ops)) {
        const body = op.requestBody?.content["application/json"];
        if (body === undefined) continue;
        operations += 1;
        const procedure = path.replace(/^\/v1\//, "").replace(/\/(bulk|report)$/, "");
        const [example] = Object.values(body.examples ?? {}) as { $ref?: string; value?: unknown }[];
        const value = example?.$ref
          ? doc.components.examples[example.$ref.replace("#/components/examples/", "")]?.value
          : example?.value;
        const expected = examples.get(procedure);
        expect(expected, procedure).toBeDefined();
        expect(value, path).toEqual(path.endsWith("/bulk") ? [expected] : expected);
      }
    expect(operations).toBe(2 * procedureEntries().length + 2); // /v1/<name>, its bulk, and the two reports
  });
});
