import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";

// A performance note in code names the bench row that shows its effect (DEVELOPERS.md, "Performance"):
// every "row `x`" / "rows `x`" in the code names a part of bench/results.json.
const root = projectRoot();
const parts = new Set(
  Object.keys((JSON.parse(readFileSync(join(root, "bench", "results.json"), "utf8")) as { parts: object }).parts),
);
const sources = (dir: string): string[] =>
  readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return sources(p);
    return p.endsWith(".ts") || p.endsWith(".mjs") ? [p] : [];
  });

describe("bench rows named in code", () => {
  it("exist in bench/results.json", () => {
    const named: string[] = [];
    for (const dir of ["adapters", "api", "contracts", "domain"])
      for (const file of sources(join(root, dir))) {
        const text = readFileSync(file, "utf8").replace(/\n\s*(\/\/|\*)\s*/g, " ");
        for (const m of text.matchAll(/\brows? `([^`]+)`/g)) named.push(`${relative(root, file)}: ${m[1]}`);
      }
    expect(named.length).toBeGreaterThan(0);
    expect(named.filter((n) => !parts.has(n.slice(n.lastIndexOf(": ") + 2)))).toEqual([]);
  });
});
