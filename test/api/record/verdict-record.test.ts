import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { catalogOf } from "../../../adapters/catalog/file-catalog.js";
import { projectRoot } from "../../../adapters/project-root.js";
import type { Context } from "../../../api/context.js";
import { callProcedure, procedureEntries } from "../../../api/procedure-registry.js";
import { verdictRecord } from "../../../contracts/record.js";
import type { VerifyOutput } from "../../../contracts/verify.js";
import { demoContext } from "../../helpers/app.js";

// Independent of the service's own helpers: canonical JSON written out here (keys sorted at every
// level, as JSON.stringify writes values) and SHA-256 from node:crypto (FIPS 180-4).
function canonical(v: unknown): string {
  if (v === null || typeof v !== "object") return JSON.stringify(v) ?? "null";
  if (Array.isArray(v)) return `[${v.map(canonical).join(",")}]`;
  const o = v as Record<string, unknown>;
  return `{${Object.keys(o)
    .filter((k) => o[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonical(o[k])}`)
    .join(",")}}`;
}
const sha = (v: unknown) => `sha256:${createHash("sha256").update(canonical(v)).digest("hex")}`;

const dir = join(projectRoot(), "examples", "requests");
const examples = readdirSync(dir)
  .filter((f) => f.endsWith(".json"))
  .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")) as { id: string; procedure: string; input: unknown });
type Rec = Record<string, unknown>;
type Invoker = (procedure: string, input: unknown) => unknown;
// every handler is synchronous: callProcedure answers in this turn
const procedureInvoker =
  (ctx: Context): Invoker =>
  (procedure, input) =>
    callProcedure(procedure, ctx, input);
function call(invoker: Invoker, procedure: string, input: unknown): Rec {
  return invoker(procedure, input) as Rec;
}

describe("verdict record on every analysis result", () => {
  const invoke = procedureInvoker(demoContext());
  const answers = examples.map((e) => ({ e, result: call(invoke, e.procedure, e.input) }));

  it("every result with modelVersion carries a record, and only those", () => {
    for (const { e, result } of answers) {
      expect("record" in result, e.procedure).toBe(typeof result.modelVersion === "string");
    }
    const analyses = answers.filter((a) => "record" in a.result).map((a) => a.e.procedure);
    // not rules.list, rules.show, verify, catalog.list, catalog.show
    expect(analyses.length).toBe(procedureEntries().length - 5);
  });

  it("its digests are SHA-256 of the canonical input as sent, and of the result without the record", () => {
    for (const { e, result } of answers) {
      if (!("record" in result)) continue;
      const { record, ...rest } = result;
      const r = verdictRecord.parse(record);
      expect(r.procedure).toBe(e.procedure);
      expect(r.sentSha256).toBe(sha(e.input));
      expect(r.resultSha256).toBe(sha(rest));
      expect(r.modelVersion).toBe(result.modelVersion);
      expect(r.buildVersion).toBe(
        (JSON.parse(readFileSync(join(projectRoot(), "package.json"), "utf8")) as Rec).version,
      );
      expect(r.signature).toBeUndefined();
    }
  });

  it("the understood input resolves each catalog part used to its data (a change of that data moves inputSha256 only)", () => {
    const e = examples.find((x) => x.procedure === "operatingPoint") as (typeof examples)[number];
    const ctx = demoContext();
    const r = verdictRecord.parse(call(procedureInvoker(ctx), "operatingPoint", e.input).record);
    expect(r.parts).toEqual(["demo-ideal-diode-60v-3mohm"]);
    expect(r.catalog).toEqual(ctx.catalog.stamp);
    const part = ctx.catalog.find("demo-ideal-diode-60v-3mohm");
    const parsed = procedureEntries()
      .find((p) => p.path === "operatingPoint")
      ?.input.parse(e.input);
    expect(r.inputSha256).toBe(sha({ input: parsed, parts: [{ id: part?.id, sha256: sha(part) }] }));
  });

  it("names the rule sets the call evaluated", () => {
    const e = examples.find((x) => x.procedure === "review") as (typeof examples)[number];
    const r = verdictRecord.parse(call(invoke, "review", e.input).record);
    expect(r.ruleSets.map((s) => s.id)).toEqual([(e.input as { ruleSet?: string }).ruleSet ?? "default"]);
    expect(r.ruleSets[0]?.hash).toMatch(/^sha256:[0-9a-f]{64}$/);
  });

  it("lists each least-squares curve fit the call made: where, RMS and worst residual (issue 23)", () => {
    const e = examples.find((x) => x.procedure === "fit") as (typeof examples)[number];
    const result = call(invoke, "fit", e.input);
    const q = result.quality as Rec;
    expect(verdictRecord.parse(result.record).fits).toEqual([
      {
        path: "diode.points",
        unit: q.unit,
        points: (e.input as { diode: { points: unknown[] } }).diode.points.length,
        rmsResidual: q.rms,
        worstResidual: q.worstResidual,
        worstPoint: q.worstPoint,
        worstFraction: q.worstFraction,
        boundFraction: q.boundFraction,
        accepted: false,
      },
    ]);
    // a catalog part given by curves is mapped once and replayed: every call that uses it lists its fits
    const op = examples.find((x) => x.procedure === "operatingPoint") as (typeof examples)[number];
    const input = { ...(op.input as Rec), stage: { kind: "catalog-part", partId: "demo-pfet-40v-9mohm-curves" } };
    const fresh = procedureInvoker(demoContext());
    const first = verdictRecord.parse(call(fresh, "operatingPoint", input).record).fits ?? [];
    const second = verdictRecord.parse(call(fresh, "operatingPoint", input).record).fits ?? [];
    expect(first.length).toBeGreaterThan(0);
    expect(first.every((f) => f.path.startsWith("stage."))).toBe(true);
    expect(second).toEqual(first);
    // an inline stage without curves: no fits
    expect(
      verdictRecord.parse(
        call(invoke, "rules.evaluate", examples.find((x) => x.procedure === "rules.evaluate")?.input).record,
      ).fits,
    ).toBeUndefined();
  });

  it("same input and versions: byte-identical results in two runs with fresh contexts", () => {
    const again = procedureInvoker(demoContext());
    for (const { e, result } of answers) {
      expect(JSON.stringify(call(again, e.procedure, e.input)), e.procedure).toBe(JSON.stringify(result));
    }
  });
});

describe("verify: a review's record", () => {
  const invoke = procedureInvoker(demoContext());
  const e = examples.find((x) => x.procedure === "review") as (typeof examples)[number];
  const result = call(invoke, "review", e.input);
  const filedText = JSON.stringify({ id: e.id, procedure: "review", input: e.input, result });
  const verify = async (text: string) =>
    (call(invoke, "verify", { records: [JSON.parse(text)] }) as unknown as VerifyOutput).reports[0];

  it("verifies as filed: unchanged, identical, digests match, unsigned said", async () => {
    const r = await verify(filedText);
    expect(r).toMatchObject({ status: "unchanged", identical: true, signature: "unsigned", moved: [] });
    expect(r?.digests).toEqual({ sent: "match", result: "match" });
  });

  it("one changed byte of the stored result or of the stored input is tampering", async () => {
    const at = filedText.indexOf('"tjC":{"value":') + '"tjC":{"value":'.length + 5; // a digit after the decimal point
    expect(filedText[at]).toMatch(/[0-9]/);
    const digit = filedText[at] === "1" ? "2" : "1";
    const inResult = filedText.slice(0, at) + digit + filedText.slice(at + 1);
    expect(await verify(inResult)).toMatchObject({
      status: "tampered",
      digests: { sent: "match", result: "mismatch" },
    });
    const inputAt = filedText.indexOf('"input":') + filedText.slice(filedText.indexOf('"input":')).search(/[0-9]/);
    const inInput =
      filedText.slice(0, inputAt) + (filedText[inputAt] === "1" ? "2" : "1") + filedText.slice(inputAt + 1);
    expect(await verify(inInput)).toMatchObject({ status: "tampered", digests: { sent: "mismatch", result: "match" } });
  });

  it("a corrected datasheet in the catalog: inputSha256 and the catalog stamp moved, the numbers said", async () => {
    const op = examples.find((x) => x.procedure === "operatingPoint") as (typeof examples)[number];
    const ctx = demoContext();
    const filed = call(procedureInvoker(ctx), "operatingPoint", op.input);
    const parts = ctx.catalog
      .list()
      .map((p) =>
        p.id === "demo-ideal-diode-60v-3mohm"
          ? { ...p, stage: { ...p.stage, thermal: { ...(p.stage.thermal as Rec), rthJaKPerW: 50 } } }
          : p,
      );
    const corrected = { ...ctx, catalog: catalogOf(ctx.catalog.stamp.id, parts as Parameters<typeof catalogOf>[1]) };
    const out = call(procedureInvoker(corrected), "verify", {
      records: [{ procedure: "operatingPoint", input: op.input, result: filed }],
    }) as unknown as VerifyOutput;
    expect(out.reports[0]).toMatchObject({ status: "numbers-changed", moved: ["inputSha256", "catalog"] });
    expect(out.reports[0]?.numbers?.path).toMatch(/^point\./);
  });

  it("a result without a record is said, not passed", async () => {
    const { record: _, ...bare } = result;
    const r = await verify(JSON.stringify({ procedure: "review", input: e.input, result: bare }));
    expect(r?.status).toBe("no-record");
  });
});
