import { readFileSync } from "node:fs";
import { join } from "node:path";
import { Validator } from "@seriousme/openapi-schema-validator";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { openApiDocument, openApiText } from "../../api/openapi.js";
import { procedureEntries } from "../../api/procedure-registry.js";
import { testApp } from "../helpers/app.js";

const committedFile = join(projectRoot(), "contracts", "openapi.json");

describe("OpenAPI 3.1 document", () => {
  it("is a valid OpenAPI 3.1 document (checked by an OpenAPI schema validator)", async () => {
    const v = new Validator();
    const res = await v.validate(openApiDocument());
    expect(res.errors ?? []).toEqual([]);
    expect(res.valid).toBe(true);
    expect(v.version).toBe("3.1");
    expect(
      (await new Validator().validate({ openapi: "3.1.0", paths: { "/x": { post: { responses: 5 } } } })).valid,
    ).toBe(false); // the validator can fail
  });

  it("has a /v1 path and a bulk path for every procedure of the table, with its input and output schema", () => {
    const doc = openApiDocument() as {
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
    if (committed !== openApiText()) {
      throw new Error(
        "contracts/openapi.json is out of date with the router and contracts: run `npm run openapi` and commit the result",
      );
    }
  });

  it("is served at /openapi.json", async () => {
    const res = await testApp().app.request("/openapi.json");
    expect(res.status).toBe(200);
    expect(await res.text()).toBe(openApiText());
  });
});
