import { describe, expect, it } from "vitest";
import { catalogListOutput, catalogShowOutput } from "../../contracts/catalog.js";
import { LIMITS } from "../../contracts/limits.js";
import { demoContext, testApp } from "../helpers/app.js";

const { app } = testApp();
const catalog = demoContext().catalog;
const post = async (procedure: string, input: unknown) => {
  const res = await app.request(`/v1/${procedure}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(input),
  });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
};
const sortedIds = catalog
  .list()
  .map((p) => p.id)
  .sort();

describe("catalog.list", () => {
  it("gives the stamp and every part in id order; pages of two reach every part once", async () => {
    const all = catalogListOutput.parse((await post("catalog.list", {})).body);
    expect(all.stamp).toEqual(catalog.stamp);
    expect(all.total).toBe(catalog.stamp.partCount);
    expect(all.parts.map((p) => p.id)).toEqual(sortedIds);
    expect(all.nextOffset).toBeUndefined();
    const seen: string[] = [];
    let offset: number | undefined = 0;
    while (offset !== undefined) {
      const page = catalogListOutput.parse((await post("catalog.list", { offset, limit: 2 })).body);
      expect(page.parts.length).toBeLessThanOrEqual(2);
      seen.push(...page.parts.map((p) => p.id));
      offset = page.nextOffset;
    }
    expect(seen).toEqual(sortedIds);
  });

  it("filters by kind, each entry with the part's kind and description", async () => {
    const out = catalogListOutput.parse((await post("catalog.list", { kind: "schottky-diode" })).body);
    const want = catalog.list().filter((p) => p.stage.kind === "schottky-diode");
    expect(out.total).toBe(want.length);
    expect(want.length).toBeGreaterThan(0);
    for (const p of out.parts) {
      expect(p.kind).toBe("schottky-diode");
      expect(p.description).toBe(catalog.find(p.id)?.description);
    }
  });

  it("a limit past BACKSTOP_MAX_CATALOG_LIST_PARTS is refused as limit-exceeded", async () => {
    const r = await post("catalog.list", { limit: LIMITS.maxCatalogListParts + 1 });
    expect(r.status).toBe(422);
    expect(r.body.code).toBe("limit-exceeded");
    expect(JSON.stringify(r.body)).toContain("BACKSTOP_MAX_CATALOG_LIST_PARTS");
  });
});

describe("catalog.show", () => {
  it("gives the part as the analyses read it, with the stamp", async () => {
    const out = catalogShowOutput.parse((await post("catalog.show", { id: "demo-schottky-5a-45v" })).body);
    expect(out.stamp).toEqual(catalog.stamp);
    expect(out.part).toEqual(catalog.find("demo-schottky-5a-45v"));
  });

  it("an unknown id gets the did-you-mean error the stages get", async () => {
    const shown = await post("catalog.show", { id: "demo-schottky-5a-54v" });
    const resolved = await post("operatingPoint", {
      stage: { kind: "catalog-part", partId: "demo-schottky-5a-54v" },
      supplyV: 12,
      load: { kind: "constant-current", currentA: 1 },
      ambientC: 25,
    });
    expect(shown.status).toBe(400);
    expect(shown.body.code).toBe("unknown-part");
    const issues = shown.body.issues as { path: unknown[]; message: string }[];
    expect(issues[0]?.path).toEqual(["id"]);
    expect(issues[0]?.message).toContain('did you mean "demo-schottky-5a-45v"?');
    expect(issues[0]?.message).toBe((resolved.body.issues as { message: string }[])[0]?.message);
  });
});
