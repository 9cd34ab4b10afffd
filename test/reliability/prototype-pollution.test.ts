import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { afterEach, describe, expect, it } from "vitest";
import { streamBatch } from "../../adapters/batch/engine.js";
import { loadCatalogFile } from "../../adapters/catalog/file-catalog.js";
import { ruleSetFromText } from "../../adapters/rulesets/parse-rule-set.js";
import { demoContext, testApp } from "../helpers/app.js";
import { exampleInputs } from "./request-fuzz.js";

/**
 * No key of an input reaches a prototype, through any entry point: each is sent `__proto__`,
 * `constructor` and `prototype` keys (at the top and nested), must refuse them, and afterwards no
 * object of the process has gained a property.
 */
const HOSTILE = [
  '"__proto__":{"polluted":"yes"}',
  '"constructor":{"prototype":{"polluted":"yes"}}',
  '"prototype":{"polluted":"yes"}',
];
const op = JSON.stringify(exampleInputs().get("operatingPoint"));
/** The operating point's example with a hostile key added at the top and inside `load`. */
const hostileBodies = HOSTILE.flatMap((h) => [`${op.slice(0, -1)},${h}}`, op.replace('"load":{', `"load":{${h},`)]);

function expectClean(): void {
  for (const o of [{}, [], Object.create(Object.prototype), () => undefined] as unknown[])
    expect((o as { polluted?: unknown }).polluted).toBeUndefined();
  expect(Object.keys(Object.prototype)).toEqual([]);
  expect(Object.getOwnPropertyNames(Object.prototype)).not.toContain("polluted");
}

describe("no prototype pollution through any entry point", () => {
  const { app } = testApp();
  const post = (path: string, body: string) =>
    app.request(path, { method: "POST", headers: { "content-type": "application/json" }, body });
  afterEach(expectClean);

  it("/v1, /v1 bulk, /trpc (POST and GET) and the report route refuse every hostile key", async () => {
    for (const body of hostileBodies) {
      for (const res of [
        await post("/v1/operatingPoint", body),
        await post("/trpc/operatingPoint", body),
        await app.request(`/trpc/operatingPoint?input=${encodeURIComponent(body)}`),
      ]) {
        expect(res.status).toBe(400);
        expect(await res.text()).toMatch(/never a field/);
      }
      const bulk = (await (await post("/v1/operatingPoint/bulk", `[${body}]`)).json()) as { failed: number };
      expect(bulk.failed).toBe(1);
    }
    const review = JSON.stringify(exampleInputs().get("review"));
    const report = await post(
      "/v1/review/report?format=json",
      `${review.slice(0, -1)},"__proto__":{"polluted":"yes"}}`,
    );
    expect(report.status).toBe(400);
  });

  it("rules.evaluate: hostile keys in metrics, part and an inline rule set", async () => {
    const ev = exampleInputs().get("rules.evaluate") as Record<string, unknown>;
    const text = JSON.stringify(ev);
    for (const h of HOSTILE) {
      for (const body of [text.replace('"metrics":{', `"metrics":{${h},`), text.replace('"part":{', `"part":{${h},`)]) {
        expect((await post("/v1/rules.evaluate", body)).status).toBe(400);
      }
    }
  });

  it("batch: JSON Lines lines and CSV columns", async () => {
    const lines = hostileBodies.map((b, i) => `{"id":${i},"procedure":"operatingPoint","input":${b}}`);
    lines.push(`{"id":"top","procedure":"operatingPoint","input":${op},"__proto__":{"polluted":"yes"}}`);
    const csv = [
      "id,procedure,__proto__.polluted,constructor.prototype.polluted,load.prototype.polluted",
      "1,operatingPoint,yes,,",
      "2,operatingPoint,,yes,",
      "3,operatingPoint,,,yes",
    ].join("\n");
    // with reports too: a line of a report procedure is read again to set its flag
    const reports = { flags: { operatingPoint: "curves" }, onRow: () => undefined };
    for (const [inFormat, text, extra] of [
      ["jsonl", lines.join("\n"), {}],
      ["csv", csv, {}],
      ["jsonl", lines.join("\n"), { reports }],
    ] as const) {
      const parts: string[] = [];
      const counts = await streamBatch({
        input: Readable.from([Buffer.from(text)]),
        inFormat,
        outFormat: "jsonl",
        write: async (c) => void parts.push(Buffer.from(c).toString("utf8")),
        ctx: demoContext(),
        ...extra,
      });
      expect(counts.ok).toBe(0);
      expect(counts.failed).toBe(inFormat === "jsonl" ? lines.length : 3);
      expect(parts.join("")).toMatch(/never a field/);
    }
  });

  it("rule-set files (JSON and YAML) and the parts catalog file", () => {
    const set = {
      id: "s",
      version: "1",
      description: "d",
      rules: [
        {
          id: "r",
          title: "t",
          appliesTo: "all",
          expression: "tjWorstC <= 150",
          severity: "fail",
          source: "memory",
          rationale: "r",
        },
      ],
    };
    const json = JSON.stringify(set);
    for (const h of HOSTILE) {
      for (const text of [`${json.slice(0, -1)},${h}}`, json.replace('"rules":[{', `"rules":[{${h},`)]) {
        const r = ruleSetFromText(text, "s.json");
        expect(r.ok).toBe(false);
      }
    }
    const yaml =
      "id: s\nversion: '1'\ndescription: d\n__proto__:\n  polluted: yes\nrules:\n  - id: r\n    title: t\n    appliesTo: all\n    expression: tjWorstC <= 150\n    severity: fail\n    source: memory\n    rationale: r\n";
    expect(ruleSetFromText(yaml, "s.yaml").ok).toBe(false);
    const dir = mkdtempSync(join(tmpdir(), "backstop-pollution-"));
    const file = join(dir, "catalog.json");
    writeFileSync(file, '{"catalog":"c","parts":[],"__proto__":{"polluted":"yes"}}');
    expect(() => loadCatalogFile(file)).toThrow(/never a field/);
  });
});
