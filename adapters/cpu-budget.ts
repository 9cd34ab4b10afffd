import { readFileSync } from "node:fs";
import { availableParallelism } from "node:os";

/**
 * Whole CPUs this process may use: the CPUs it may run on, capped by a container's CPU quota
 * (cgroup v2 `cpu.max`, or v1 `cpu.cfs_quota_us` / `cpu.cfs_period_us`), at least 1. Node's own
 * count sees the host's CPUs, not the quota, and a process sized to it would overrun a limit.
 */
export function cpuBudget(read: (path: string) => string | undefined = readQuiet): number {
  const cpus = availableParallelism();
  const quota = quotaCpus(read);
  return Math.max(1, quota === undefined ? cpus : Math.min(cpus, Math.floor(quota)));
}

/** The quota in CPUs (quota / period), or undefined where none is set or none can be read. */
export function quotaCpus(read: (path: string) => string | undefined): number | undefined {
  const v2 = read("/sys/fs/cgroup/cpu.max")?.trim().split(/\s+/);
  if (v2 !== undefined && v2.length === 2) return ratio(v2[0], v2[1]);
  return ratio(
    read("/sys/fs/cgroup/cpu/cpu.cfs_quota_us")?.trim(),
    read("/sys/fs/cgroup/cpu/cpu.cfs_period_us")?.trim(),
  );
}

function ratio(quota: string | undefined, period: string | undefined): number | undefined {
  if (quota === undefined || period === undefined || quota === "max" || quota === "-1") return undefined;
  const q = Number(quota);
  const p = Number(period);
  return Number.isFinite(q) && Number.isFinite(p) && q > 0 && p > 0 ? q / p : undefined;
}

function readQuiet(path: string): string | undefined {
  try {
    return readFileSync(path, "utf8");
  } catch {
    return undefined;
  }
}
