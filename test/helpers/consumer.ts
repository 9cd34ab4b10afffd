import { execFile } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { promisify } from "node:util";
import { transformSync } from "esbuild";
import { projectRoot } from "../../adapters/project-root.js";

const run = promisify(execFile);

/**
 * A throwaway consumer project: a folder under dist/ (inside the package, so `backstop/...`
 * resolves by self-reference through package.json `exports`, and the project's node_modules are
 * found), with the compiler settings a client would use (TypeScript 7 needs `types: ["node"]`).
 */
export function consumerDir(prefix: string): { dir: string; remove: () => void } {
  mkdirSync(join(projectRoot(), "dist"), { recursive: true });
  const dir = mkdtempSync(join(projectRoot(), "dist", `${prefix}-`));
  writeFileSync(
    join(dir, "tsconfig.json"),
    JSON.stringify({
      compilerOptions: {
        target: "es2022",
        lib: ["es2023", "dom"],
        module: "nodenext",
        moduleResolution: "nodenext",
        types: ["node"],
        strict: true,
        skipLibCheck: true,
        noEmit: true,
      },
      include: ["*.ts"],
    }),
  );
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** `tsc -p <dir>` (the project's TypeScript): whether it type-checks, and what it said. */
export async function typecheck(dir: string): Promise<{ ok: boolean; output: string }> {
  const tsc = join(projectRoot(), "node_modules", "typescript", "bin", "tsc");
  try {
    const { stdout, stderr } = await run(process.execPath, [tsc, "-p", join(dir, "tsconfig.json")], {
      timeout: 120_000,
    });
    return { ok: true, output: stdout + stderr };
  } catch (e) {
    const err = e as { stdout?: string; stderr?: string; message: string };
    return { ok: false, output: `${err.stdout ?? ""}${err.stderr ?? ""}` || err.message };
  }
}

/** A consumer's .ts file run by node: types stripped by esbuild (no bundling), imports resolved by node. */
export async function runTs(file: string, args: readonly string[]): Promise<string> {
  const js = transformSync(readFileSync(file, "utf8"), { loader: "ts", format: "esm", target: "node20" }).code;
  const out = file.replace(/\.ts$/, ".mjs");
  writeFileSync(out, js);
  const { stdout } = await run(process.execPath, [out, ...args], { timeout: 60_000 });
  return stdout;
}
