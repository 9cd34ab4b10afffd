import { execFileSync, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";

// The CI run's last line (.ci/summary.mjs, called by .ci/run) over a vitest JSON report written by
// vitest 4.1 for four files (test/fixtures/ci/vitest-report.json, trimmed): two passing tests; a
// describe with one passing and one failing test; a file that fails to load; a describe whose
// beforeAll throws (its test skipped) beside an it.skip. vitest's numFailedTestSuites is 5 there
// (each failed file and the describe around the failing test): summed with numFailedTests it gave 6.

const root = projectRoot();
const fixture = join(root, "test/fixtures/ci/vitest-report.json");
const summary = (args: string[], env: Record<string, string> = {}) => {
  const { CI: _ci, ...rest } = process.env;
  const r = spawnSync(process.execPath, [join(root, ".ci/summary.mjs"), ...args], {
    env: { ...rest, ...env },
    encoding: "utf8",
  });
  const lines = r.stdout.trim().split("\n");
  return { lines, last: lines.at(-1), status: r.status };
};

describe("the CI summary's count", () => {
  it("counts a failed test once and a file that failed without a failed test (load, hook) as one failure", () => {
    const r = summary([`suite=${fixture}`]);
    expect(r.last).toBe("3 passed, 3 failed, 2 skipped");
    expect(r.lines[0]).toBe("suite: 3 passed, 3 failed, 2 skipped");
    expect(r.status).toBe(1);
  });

  it("sums the reports, counts a missing one as one failure, and a skip as a failure under CI=true", () => {
    const r = summary([`a=${fixture}`, `b=${fixture}`, "soak=/nonexistent/soak.json"], { CI: "true" });
    expect(r.lines).toContain("soak wrote no report: counted as a failure");
    expect(r.last).toBe("6 passed, 11 failed, 4 skipped");
  });

  it("a report of passing tests only gives 0 failed and exit status 0", () => {
    const report = JSON.parse(readFileSync(fixture, "utf8"));
    const passing = {
      ...report,
      numFailedTests: 0,
      numPendingTests: 0,
      numPassedTests: 2,
      numFailedTestSuites: 0,
      testResults: report.testResults.slice(0, 1),
    };
    const file = join(mkdtempSync(join(tmpdir(), "backstop-ci-")), "passing.json");
    writeFileSync(file, JSON.stringify(passing));
    const r = summary([`suite=${file}`], { CI: "true" });
    expect(r.last).toBe("2 passed, 0 failed");
    expect(r.status).toBe(0);
  });

  it(".ci/run prints its last line through this script", () => {
    expect(readFileSync(join(root, ".ci/run"), "utf8")).toMatch(/\nnode \.ci\/summary\.mjs "node 20 suite=/);
    expect(execFileSync("bash", ["-n", join(root, ".ci/run")]).toString()).toBe("");
  });
});
