#!/usr/bin/env node
// The batch command line. Needs the built code (npm run build, which npm start and npm run demo do).
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";

// the bundle (one file, and its compute threads load one too: a tenth of a second less at start)
const cli = new URL("../dist/bundle/cli.js", import.meta.url);
if (!existsSync(fileURLToPath(cli))) {
  process.stderr.write("backstop: not built yet; run `npm run build` first\n");
  process.exit(2);
}
const { main } = await import(cli.href);
process.exitCode = await main(process.argv.slice(2));
