// The CI run's last line: vitest's JSON reports summed as `N passed, N failed` (.ci/run calls it;
// test/ci/summary.test.ts runs it over a fixture). Arguments: `name=path` per report; a report that
// is missing counts as one failure. A failure is a failed test, or a test file that failed with no
// failed test in it (it did not load, or a hook threw): vitest's numFailedTestSuites also counts
// each file and describe block around a failed test, so it is not added. Under CI=true a skipped
// test counts as a failure.
import { existsSync, readFileSync } from "node:fs";

/** Passed, failed and skipped counts of one vitest JSON report (null: none was written). */
function countReport(r) {
  if (r === null) return { passed: 0, failed: 1, skipped: 0 };
  const files = r.testResults ?? [];
  const brokenFiles = files.filter(
    (f) => f.status === "failed" && !(f.assertionResults ?? []).some((a) => a.status === "failed"),
  ).length;
  return {
    passed: r.numPassedTests ?? 0,
    failed: (r.numFailedTests ?? 0) + brokenFiles,
    skipped: (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0),
  };
}

function main(args) {
  const total = { passed: 0, failed: 0, skipped: 0 };
  for (const arg of args) {
    const at = arg.indexOf("=");
    const [name, file] = at < 0 ? [arg, arg] : [arg.slice(0, at), arg.slice(at + 1)];
    const r = existsSync(file) ? JSON.parse(readFileSync(file, "utf8")) : null;
    const c = countReport(r);
    if (r === null) console.log(`${name} wrote no report: counted as a failure`);
    else console.log(`${name}: ${c.passed} passed, ${c.failed} failed, ${c.skipped} skipped`);
    for (const k of Object.keys(total)) total[k] += c[k];
  }
  let failed = total.failed;
  if (process.env.CI === "true" && total.skipped > 0) {
    console.log(`${total.skipped} test(s) skipped under CI=true: a skip is a failure here`);
    failed += total.skipped;
  }
  console.log(`${total.passed} passed, ${failed} failed${total.skipped ? `, ${total.skipped} skipped` : ""}`);
  return failed > 0 ? 1 : 0;
}

process.exitCode = main(process.argv.slice(2));
