import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadRuleSetFolder } from "../../../adapters/rulesets/folder.js";
import { loadRuleSetStore } from "../../../adapters/rulesets/registry.js";
import { evaluateRuleSet } from "../../../domain/rules/evaluate-rules.js";

const dir = mkdtempSync(join(tmpdir(), "backstop-rules-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const rule = (id: string, expression: string) => ({
  id,
  title: id,
  appliesTo: "all",
  expression,
  severity: "fail",
  source: "company policy",
  rationale: "test rule for the loader",
});
writeFileSync(
  join(dir, "acme.json"),
  JSON.stringify({
    id: "acme",
    version: "2024.1",
    description: "company set",
    rules: [rule("acme-tj", "tjWorstC <= part.tjMaxC - 30 K")],
  }),
);
writeFileSync(
  join(dir, "beta.yaml"),
  [
    "id: beta",
    "version: '3'",
    "description: company set in YAML",
    "rules:",
    "  - id: beta-drop",
    "    title: drop under half a volt",
    "    appliesTo: [schottky-diode, pn-diode]",
    "    expression: dropWorstV <= 500 mV",
    "    severity: warn",
    "    source: company policy",
    "    rationale: keeps loss at the worst corner low",
  ].join("\n"),
);
writeFileSync(
  join(dir, "broken.yml"),
  [
    "id: broken",
    "version: '1'",
    "description: one bad rule",
    "rules:",
    "  - id: good",
    "    title: t",
    "    appliesTo: all",
    "    expression: tjWorstC <= 100",
    "    severity: fail",
    "    source: s",
    "    rationale: a good rule",
    "  - id: sneaky",
    "    title: t",
    "    appliesTo: all",
    '    expression: tjWorstC <= evaluate("1")',
    "    severity: fail",
    "    source: s",
    "    rationale: a bad rule",
  ].join("\n"),
);
writeFileSync(
  join(dir, "shape.json"),
  JSON.stringify({
    id: "shape",
    version: "1",
    description: "missing severity",
    rules: [{ ...rule("no-sev", "tjWorstC <= 1"), severity: "maybe" }],
  }),
);
writeFileSync(
  join(dir, "clash.json"),
  JSON.stringify({
    id: "default",
    version: "9",
    description: "tries to shadow the built-in",
    rules: [rule("x", "tjWorstC <= 1000")],
  }),
);
// one line, its id not the first key: still cited by id
writeFileSync(
  join(dir, "late-id.json"),
  JSON.stringify({
    version: "1",
    id: "late",
    description: "bad expression",
    rules: [rule("late-x", "tjWorstC <=> 1")],
  }),
);
writeFileSync(join(dir, "notes.txt"), "not a rule file");

describe("rules folder with bad files", () => {
  it("loads the good sets and reports each bad file with the rule and position", () => {
    const out = loadRuleSetFolder(dir, new Set(["default"]));
    expect(out.sets.map((s) => s.stamp.id)).toEqual(["acme", "beta"]);
    expect(out.refused.map((r) => r.file)).toEqual(["broken.yml", "clash.json", "late-id.json", "shape.json"]);
    expect(out.refused.map((r) => r.setId)).toEqual(["broken", "default", "late", "shape"]);
    const broken = out.refused[0];
    expect(broken?.setId).toBe("broken");
    expect(broken?.problems).toEqual([
      {
        source: "broken.yml",
        ruleId: "sneaky",
        path: ["rules", 1, "expression"],
        column: 13,
        message: "rule sneaky, expression column 13: function 'evaluate' is refused in the rules sandbox",
      },
    ]);
    expect(out.refused[1]?.problems[0]?.message).toContain("'default' is already taken");
    expect(out.refused[3]?.problems[0]).toMatchObject({ ruleId: "no-sev", path: ["rules", 0, "severity"] });
  });
  it("the store serves the good sets, and a request naming a refused set learns why", () => {
    const store = loadRuleSetStore(dir);
    expect(store.list().map((s) => s.stamp.id)).toEqual(["default", "vehicle", "consumer", "acme", "beta"]);
    const refused = store.get("broken");
    expect(refused.ok).toBe(false);
    if (!refused.ok)
      expect(refused.message).toMatch(/refused at load \(broken\.yml\).*rule sneaky, expression column 13/);
    // files written on one line are cited the same way
    expect(store.get("shape")).toMatchObject({
      ok: false,
      message: expect.stringMatching(/refused at load \(shape\.json\)/),
    });
    expect(store.get("late")).toMatchObject({
      ok: false,
      message: expect.stringMatching(/refused at load \(late-id\.json\).*rule late-x/),
    });
    const beta = store.get("beta");
    if (!beta.ok) throw new Error(beta.message);
    const res = evaluateRuleSet(beta.set, { stageKind: "schottky-diode", metrics: { dropWorstV: 0.62 }, part: {} });
    expect(res.verdicts[0]).toMatchObject({ outcome: "warn", threshold: 0.5, ruleSet: { id: "beta", version: "3" } });
    expect(store.get("nope")).toMatchObject({ ok: false, message: expect.stringContaining("unknown rule set 'nope'") });
  });
});
