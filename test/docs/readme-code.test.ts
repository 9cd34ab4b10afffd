import { type ChildProcess, execFile } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { projectRoot } from "../../adapters/project-root.js";
import { startBuiltServer } from "../helpers/built-server.js";
import { consumerDir, runTs, typecheck } from "../helpers/consumer.js";

/**
 * Every TypeScript and Python block of README.md, run as a reader would run it against the built
 * server: the only change is the server's address (README says http://localhost:8080; the test's
 * server listens on a port of its own). TypeScript is type-checked as a consumer's file (imports
 * by package name) and run by node; Python by python3 (standard library only).
 */
const README = readFileSync(join(projectRoot(), "README.md"), "utf8");
const blocks = [...README.matchAll(/^```(ts|typescript|python|py)\n([\s\S]*?)^```$/gm)].map((m, i) => ({
  lang: m[1] === "ts" || m[1] === "typescript" ? ("ts" as const) : ("python" as const),
  code: m[2] as string,
  line: README.slice(0, m.index).split("\n").length + 1,
  n: i,
}));

let server: { child: ChildProcess; base: string };
const project = consumerDir("readme");
const run = promisify(execFile);

beforeAll(async () => {
  server = await startBuiltServer({});
}, 120_000);
afterAll(() => {
  server?.child.kill();
  project.remove();
});

const here = (code: string) => code.replaceAll("http://localhost:8080", server.base);

describe("README code blocks", () => {
  it("has TypeScript and Python blocks to run", () => {
    expect(blocks.filter((b) => b.lang === "ts").length).toBeGreaterThan(0);
    expect(blocks.filter((b) => b.lang === "python").length).toBeGreaterThan(0);
    for (const b of blocks) expect(b.code, `README line ${b.line}`).toContain("http://localhost:8080");
  });

  for (const b of blocks)
    it(`the ${b.lang} block at README line ${b.line} runs and prints an answer`, async () => {
      let out: string;
      if (b.lang === "ts") {
        const file = join(project.dir, `block${b.n}.ts`);
        // a module of its own (top-level await), checked alone
        writeFileSync(file, `${here(b.code)}\nexport {};\n`);
        const checked = await typecheck(project.dir);
        expect(checked.output, `README line ${b.line}`).toBe("");
        out = await runTs(file, []);
      } else {
        const file = join(project.dir, `block${b.n}.py`);
        writeFileSync(file, here(b.code));
        out = (await run("python3", [file], { timeout: 60_000 })).stdout;
      }
      // both blocks print the junction temperature of a solved point
      expect(out.trim(), `README line ${b.line}`).toMatch(/\d+\.\d+/);
    }, 120_000);
});
