import { execFileSync } from "node:child_process";

/**
 * Whether a Debian tool the oracle tests need is on PATH. Where it is absent the test is skipped
 * with a message, except under CI=true, where .ci/run has installed it and a skip is a failure.
 */
export function toolAvailable(command: string): boolean {
  try {
    execFileSync("sh", ["-c", `command -v ${command}`], { stdio: "ignore" });
    return true;
  } catch {
    if (process.env.CI === "true") {
      throw new Error(`${command} is required under CI=true (.ci/run installs it), but it is not on PATH`);
    }
    console.warn(`skipping ${command}-based checks: ${command} is not installed (apt-get install ${command})`);
    return false;
  }
}
