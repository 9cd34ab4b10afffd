import { createRequire } from "node:module";
import type { ConfigOptions, MathJsInstance } from "mathjs";

/** The default instance; its `create` is bound to the full factory set (a fresh instance). */
export type MathJsBundle = Omit<typeof import("mathjs"), "create"> & { create(config?: ConfigOptions): MathJsInstance };

let loaded: MathJsBundle | undefined;

/**
 * mathjs's single-file build, loaded once for the whole process when first needed (rule parsing,
 * unit strings the fast path of contracts/quantity-fast-path.ts does not read), so start-up does
 * not wait for it. Loaded with require rather than `import`: the file is CommonJS, and an ESM
 * import first scans all of its 700 kB for named exports; require skips that scan and gives the
 * same module object.
 */
export function mathjs(): MathJsBundle {
  loaded ??= createRequire(import.meta.url)("mathjs/lib/browser/math.js") as MathJsBundle;
  return loaded;
}
