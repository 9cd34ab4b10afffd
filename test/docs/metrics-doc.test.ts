import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { METRICS, PART_PARAMETERS } from "../../domain/rules/metric-vocabulary.js";
import { metricsMarkdown } from "../../scripts/metrics-doc.js";

const file = join(projectRoot(), "docs", "metrics.md");

it("docs/metrics.md is the vocabulary generated from the code (npm run docs:metrics regenerates it)", () => {
  const want = metricsMarkdown();
  if (process.env.BACKSTOP_WRITE_DOCS === "1") writeFileSync(file, want);
  expect(
    readFileSync(file, "utf8"),
    "docs/metrics.md drifted from domain/rules/metric-vocabulary.ts: run npm run docs:metrics",
  ).toBe(want);
  for (const m of METRICS) expect(want).toContain(`| \`${m.name}\` |`);
  for (const m of PART_PARAMETERS) expect(want).toContain(`| \`part.${m.name}\` |`);
});
