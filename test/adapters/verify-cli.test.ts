import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { main } from "../../adapters/batch/cli.js";
import { loadRuleSetStore } from "../../adapters/rulesets/registry.js";
import { callProcedure } from "../../api/procedure-registry.js";
import { demoContext } from "../helpers/app.js";

const root = mkdtempSync(join(tmpdir(), "backstop-verify-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const rule = (id: string, expression: string) => ({
  id,
  title: id,
  appliesTo: "all",
  expression,
  severity: "fail",
  source: "company policy (test)",
  rationale: "test rule for verify",
});
/** A company set with a junction limit of `limitC` and one rule that no record comes near. */
function ruleSetDir(name: string, version: string, limitC: number): string {
  const dir = join(root, name);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir);
  writeFileSync(
    join(dir, "acme.json"),
    JSON.stringify({
      id: "acme",
      version,
      description: "company set for the verify test",
      rules: [rule("acme-tj", `tjWorstC <= ${limitC}`), rule("acme-loss", "lossWorstW <= 10")],
    }),
  );
  return dir;
}

/** Run the CLI with `env` set for the call (the CLI reads BACKSTOP_RULES_DIR), then restored. */
async function cli(args: string[], env: Record<string, string>): Promise<number> {
  const saved = Object.fromEntries(Object.keys(env).map((k) => [k, process.env[k]]));
  Object.assign(process.env, env);
  try {
    return await main(args);
  } finally {
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
  }
}
const readLines = (f: string) =>
  readFileSync(f, "utf8")
    .split("\n")
    .filter((l) => l !== "")
    .map((l) => JSON.parse(l) as Record<string, unknown>);

describe("backstop verify over a 1,000-record file", () => {
  // tjWorstC = 20 + i/8 °C (exact in binary): 20 … 144.875
  const tj = (i: number) => 20 + i / 8;
  const v1 = ruleSetDir("v1", "1.0.0", 120);
  const ctx1 = { ...demoContext(), ruleSets: loadRuleSetStore(v1) };
  const lines = Array.from({ length: 1000 }, (_, i) => {
    const input = { ruleSet: "acme", metrics: { tjWorstC: tj(i), lossWorstW: 1 }, part: {} };
    return JSON.stringify({
      id: `design-${i}`,
      procedure: "rules.evaluate",
      input,
      result: callProcedure("rules.evaluate", ctx1, input),
    });
  });
  const records = join(root, "records.jsonl");
  writeFileSync(records, `${lines.join("\n")}\n`);

  it("under the same rule set every record is unchanged (exit 0)", async () => {
    const out = join(root, "same.jsonl");
    expect(await cli(["verify", "--in", records, "--out", out], { BACKSTOP_RULES_DIR: v1 })).toBe(0);
    const report = readLines(out);
    expect(report.length).toBe(1000);
    expect(report.every((r) => r.status === "unchanged" && r.identical === true)).toBe(true);
  });

  it("a rule-set change that flips one rule's verdict is reported for exactly the affected records", async () => {
    const v2 = ruleSetDir("v2", "1.1.0", 110);
    const out = join(root, "v2.jsonl");
    expect(await cli(["verify", "--in", records, "--out", out], { BACKSTOP_RULES_DIR: v2 })).toBe(1);
    const report = readLines(out);
    const affected = Array.from({ length: 1000 }, (_, i) => i).filter((i) => tj(i) > 110 && tj(i) <= 120);
    expect(affected.length).toBe(80);
    const changed = report.filter((r) => r.status === "verdict-changed");
    expect(changed.map((r) => r.id)).toEqual(affected.map((i) => `design-${i}`));
    for (const r of changed) {
      expect(r.verdict).toMatchObject({ path: "result.outcome", from: "pass", to: "fail", rules: ["acme-tj"] });
      expect(r.moved).toEqual(["ruleSets"]);
    }
    // the others: same verdict, the moved threshold and margins are numbers that changed
    const rest = report.filter((r) => r.status !== "verdict-changed");
    expect(rest.every((r) => r.status === "numbers-changed")).toBe(true);
    expect((rest[0]?.numbers as { path: string } | undefined)?.path).toMatch(/^result\.verdicts\[acme-tj\]\./);
  });

  it("a line changed by one byte is tampered; a batch output line and a bad line are unreadable, each said", async () => {
    const bad = [...lines];
    bad[3] = (bad[3] as string).replace('"tjWorstC":20.375', '"tjWorstC":20.376');
    bad[4] = JSON.stringify({ id: "design-4", line: 5, ok: true, result: JSON.parse(bad[4] as string).result });
    bad[5] = "{ not json";
    const file = join(root, "bad.jsonl");
    writeFileSync(file, `${bad.slice(0, 8).join("\n")}\n`);
    const out = join(root, "bad-report.jsonl");
    expect(await cli(["verify", "--in", file, "--out", out], { BACKSTOP_RULES_DIR: v1 })).toBe(1);
    const report = readLines(out);
    expect(report.map((r) => r.status)).toEqual([
      "unchanged",
      "unchanged",
      "unchanged",
      "tampered",
      "unreadable",
      "unreadable",
      "unchanged",
      "unchanged",
    ]);
    expect(report[3]?.digests).toEqual({ sent: "mismatch", result: "match" });
    expect(report[4]?.reason).toMatch(/batch output line holds no input/);
    expect(report.map((r) => r.line)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });
});
