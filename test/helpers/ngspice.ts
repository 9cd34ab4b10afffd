import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/**
 * Run a netlist through ngspice in batch mode in a scratch folder with an empty .spiceinit, and
 * return the rows that `wrdata out.txt ...` in its .control block wrote (one number array a row).
 */
export function runNgspice(netlist: string): number[][] {
  const dir = mkdtempSync(join(tmpdir(), "backstop-spice-"));
  try {
    writeFileSync(join(dir, ".spiceinit"), "");
    writeFileSync(join(dir, "circuit.cir"), netlist);
    execFileSync("ngspice", ["-b", "circuit.cir"], { cwd: dir, stdio: "pipe", timeout: 120_000 });
    return readFileSync(join(dir, "out.txt"), "utf8")
      .trim()
      .split("\n")
      .map((line) => line.trim().split(/\s+/).map(Number));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
