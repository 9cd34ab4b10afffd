import { execFileSync } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { inject } from "vitest";
import type { TestProject } from "vitest/node";
import { projectRoot } from "../../adapters/project-root.js";

declare module "vitest" {
  export interface ProvidedContext {
    /** this vitest run's id: dist/ is built at most once per run (see ensureBuilt) */
    buildRun: string;
  }
}

/** vitest globalSetup: names the run; builds nothing (a test file that needs dist/ calls ensureBuilt). */
export default function setup(project: TestProject): void {
  project.provide("buildRun", randomUUID());
}

const STAMP = join(projectRoot(), "dist", ".test-build-run");
const WAIT_MS = 300_000;
const read = (p: string) => {
  try {
    return readFileSync(p, "utf8");
  } catch {
    return "";
  }
};
const pause = (ms: number) => Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);

/**
 * dist/ built (`npm run build`) once in this vitest run, by the first test file that needs the
 * built server, CLI or compute threads; the other files (in other worker processes) that need it
 * meanwhile wait for the build's stamp. A file that never calls it (most: they import the sources)
 * runs without a build.
 */
export function ensureBuilt(): void {
  const run = inject("buildRun");
  if (read(STAMP) === run) return;
  const lock = join(tmpdir(), `backstop-build-${run}`);
  let builder = true;
  try {
    mkdirSync(lock); // the run's lock: one builder
  } catch {
    builder = false;
  }
  if (builder) {
    try {
      execFileSync("npm", ["run", "build", "--silent"], { cwd: projectRoot(), stdio: "inherit" });
      writeFileSync(STAMP, run);
    } catch (e) {
      writeFileSync(STAMP, `failed ${run}`);
      throw e;
    } finally {
      rmSync(lock, { recursive: true, force: true });
    }
    return;
  }
  // another file is building: wait for its stamp (a build takes seconds)
  const deadline = Date.now() + WAIT_MS;
  for (;;) {
    const stamp = read(STAMP);
    if (stamp === run) return;
    if (stamp === `failed ${run}`) throw new Error("the build of dist/ failed in another test file (see its output)");
    if (Date.now() > deadline) throw new Error(`dist/ was not built within ${WAIT_MS / 1000} s`);
    pause(50);
  }
}

/** The command line (bin/backstop.mjs, which runs dist/), built. */
export function builtCli(): string {
  ensureBuilt();
  return join(projectRoot(), "bin", "backstop.mjs");
}
