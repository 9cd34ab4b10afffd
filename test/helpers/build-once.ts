import { execFileSync } from "node:child_process";
import { projectRoot } from "../../adapters/project-root.js";

/** vitest globalSetup: build dist/ once before any test file spawns the built server or CLI. */
export default function setup(): void {
  execFileSync("npm", ["run", "build", "--silent"], { cwd: projectRoot(), stdio: "inherit" });
}
