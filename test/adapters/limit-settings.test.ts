import { spawn } from "node:child_process";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DEFAULT_LIMITS, LimitSettingError, limitsFromEnv } from "../../contracts/limits.js";
import { projectRoot } from "../../adapters/project-root.js";
import { builtCli } from "../helpers/build-once.js";

// A bad BACKSTOP_MAX_* value: the limits are read when contracts/limits.ts loads, before the
// server's or the batch's own error handling, so it used to end the process with an uncaught error
// and its stack trace (exit 1). Now: one line naming the variable and what to type, exit 2.
const run = (args: string[], env: Record<string, string>) =>
  new Promise<{ code: number | null; stderr: string }>((resolve) => {
    const child = spawn("node", args, { env: { ...process.env, ...env }, stdio: ["ignore", "ignore", "pipe"] });
    let stderr = "";
    child.stderr?.on("data", (d: Buffer) => {
      stderr += String(d);
    });
    child.on("exit", (code) => resolve({ code, stderr }));
  });

const oneLine = (stderr: string, variable: string, got: string) => {
  expect(stderr.trimEnd().split("\n")).toHaveLength(1);
  expect(stderr).not.toMatch(/^\s+at /m);
  expect(stderr.trimEnd()).toBe(
    `backstop: ${variable} must be a positive integer, got "${got}": set it to a whole number such as ${variable}=${DEFAULT_LIMITS.maxCandidates} (the default), or unset it`,
  );
};

describe("a bad limit setting", () => {
  it("is a LimitSettingError naming the variable, the value and what to type", () => {
    expect(() => limitsFromEnv({ BACKSTOP_MAX_CANDIDATES: "1.5" })).toThrow(LimitSettingError);
    expect(() => limitsFromEnv({ BACKSTOP_MAX_CANDIDATES: "0" })).toThrow(
      `BACKSTOP_MAX_CANDIDATES must be a positive integer, got "0": set it to a whole number such as BACKSTOP_MAX_CANDIDATES=${DEFAULT_LIMITS.maxCandidates} (the default), or unset it`,
    );
    expect(limitsFromEnv({ BACKSTOP_MAX_CANDIDATES: "" }).maxCandidates).toBe(DEFAULT_LIMITS.maxCandidates);
    expect(limitsFromEnv({ BACKSTOP_MAX_CANDIDATES: "7" }).maxCandidates).toBe(7);
  });

  it("stops the built server and the batch command with one line on stderr and exit 2", async () => {
    const cli = builtCli();
    const server = await run([join(projectRoot(), "dist", "bundle", "main.js")], {
      PORT: "0",
      HOST: "127.0.0.1",
      BACKSTOP_MAX_CANDIDATES: "lots",
    });
    expect(server.code).toBe(2);
    oneLine(server.stderr, "BACKSTOP_MAX_CANDIDATES", "lots");
    const batch = await run([cli, "batch", "--in", "none.jsonl", "--out", "none-out.jsonl"], {
      BACKSTOP_MAX_CANDIDATES: "-3",
    });
    expect(batch.code).toBe(2);
    oneLine(batch.stderr, "BACKSTOP_MAX_CANDIDATES", "-3");
  });
});
