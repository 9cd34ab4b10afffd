// The server and its compute-thread worker as one ESM file each (dist/bundle/), from the compiled
// dist/ (run after tsc; `npm run build` does both): one file to load at start instead of the ~400
// modules of the import graph (start-up: the bench's start-up row, docs/performance.md). Packages loaded on
// first use through createRequire (mathjs, yaml, piscina) stay in node_modules, loaded from there.
import { build } from "esbuild";

const banner = [
  // bundled CommonJS packages call require() for node built-ins; ESM has no require of its own
  'import { createRequire as __bundleRequire } from "node:module";',
  "const require = __bundleRequire(import.meta.url);",
].join("\n");

await build({
  entryPoints: {
    // the HTTP server
    main: "dist/adapters/http/main.js",
    // the batch command line (bin/backstop.mjs)
    cli: "dist/adapters/batch/cli.js",
    worker: "dist/adapters/compute/worker.js",
  },
  outdir: "dist/bundle",
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  banner: { js: banner },
  logLevel: "warning",
  legalComments: "linked",
});
