import type { ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startBuiltServer } from "../helpers/built-server.js";

// The rule-expression size limits (contracts/limits.ts: BACKSTOP_MAX_EXPRESSION_CHARS and
// BACKSTOP_MAX_EXPRESSION_NODES) set small on the built server: an inline rule set past either is
// refused with 422 limit-exceeded naming the variable, over /v1 and /trpc; a rules-folder file past
// one is refused at load with the limit named; an expression within both is answered.
const LIMITS = { BACKSTOP_MAX_EXPRESSION_CHARS: "60", BACKSTOP_MAX_EXPRESSION_NODES: "8" };
// 30 characters, within 8 syntax nodes (answered below)
const WITHIN = "tjWorstC <= part.tjMaxC - 25 K";
// 49 characters, at least 11 nodes (five operators, six operands)
const TOO_MANY_NODES = "tjWorstC + lossWorstW + dropWorstV + 1 + 2 <= 200";
// 74 characters
const TOO_LONG = `tjWorstC <= part.tjMaxC - 25 K${" ".repeat(44)}`;

const rule = (expression: string, when?: string) => ({
  id: "r",
  title: "r",
  appliesTo: "all",
  ...(when === undefined ? {} : { when }),
  expression,
  severity: "fail",
  source: "test",
  rationale: "test",
});
const inline = (expression: string, when?: string) => ({
  stageKind: "nfet-ideal-diode",
  metrics: { tjWorstC: 96.4, lossWorstW: 0.12, dropWorstV: 0.04 },
  part: { tjMaxC: 175 },
  ruleSet: { id: "small", version: "1", description: "small", rules: [rule(expression, when)] },
});

let server: { child: ChildProcess; base: string };
const dir = mkdtempSync(join(tmpdir(), "backstop-expression-limits-"));
beforeAll(async () => {
  writeFileSync(
    join(dir, "long.json"),
    JSON.stringify({ id: "company-long", version: "1", description: "one rule too long", rules: [rule(TOO_LONG)] }),
  );
  server = await startBuiltServer({ ...LIMITS, BACKSTOP_WORKERS: "1", BACKSTOP_RULES_DIR: dir, LOG_LEVEL: "warn" });
});
afterAll(() => {
  if (server?.child.exitCode === null) server.child.kill("SIGKILL");
  rmSync(dir, { recursive: true, force: true });
});
const post = async (path: string, body: unknown) => {
  const res = await fetch(`${server.base}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  return { status: res.status, json: (await res.json()) as Record<string, unknown> };
};

describe("rule-expression size limits, configured", () => {
  it("refuses an inline expression or precondition past either limit with 422 naming the limit", async () => {
    for (const [body, variable, field] of [
      [inline(TOO_LONG), "BACKSTOP_MAX_EXPRESSION_CHARS", "expression"],
      [inline(TOO_MANY_NODES), "BACKSTOP_MAX_EXPRESSION_NODES", "expression"],
      [inline(WITHIN, TOO_MANY_NODES), "BACKSTOP_MAX_EXPRESSION_NODES", "when"],
    ] as const) {
      const v1 = await post("/v1/rules.evaluate", body);
      expect(v1.status).toBe(422);
      expect(v1.json.code).toBe("limit-exceeded");
      const issues = v1.json.issues as { path: (string | number)[]; message: string }[];
      expect(issues.map((i) => i.path.join("."))).toEqual([`ruleSet.rules.0.${field}`]);
      expect(issues[0]?.message).toMatch(new RegExp(`\\(limit ${variable}\\)$`));
      const trpc = await post("/trpc/rules.evaluate", body);
      expect(trpc.status).toBe(422);
      expect(JSON.stringify(trpc.json)).toContain(`(limit ${variable})`);
    }
  });

  it("answers an expression within both limits", async () => {
    const r = await post("/v1/rules.evaluate", inline(WITHIN));
    expect(r.status).toBe(200);
    expect((r.json.result as { outcome: string }).outcome).toBe("pass");
  });

  it("refuses a rules-folder file whose expression is past a limit, naming it", async () => {
    const r = await post("/v1/rules.list", {});
    expect(r.status).toBe(200);
    const refused = r.json.refused as { file: string; problems: { message: string }[] }[];
    const long = refused.find((f) => f.file.endsWith("long.json"));
    expect(long?.problems.map((p) => p.message)).toEqual([
      expect.stringMatching(/characters; the limit is 60 \(limit BACKSTOP_MAX_EXPRESSION_CHARS\)$/),
    ]);
  });
});
