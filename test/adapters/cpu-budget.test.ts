import { availableParallelism } from "node:os";
import { describe, expect, it } from "vitest";
import { cpuBudget, quotaCpus } from "../../adapters/cpu-budget.js";

const files = (m: Record<string, string>) => (p: string) => m[p];

describe("the CPU budget", () => {
  // cgroup v2 cpu.max is "<quota> <period>" or "max <period>"; v1 has cfs_quota_us (-1: none) and cfs_period_us (the kernel's cgroup documentation).
  it("reads a container's quota from cgroup v2 or v1, and none where it is unlimited or unreadable", () => {
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "200000 100000\n" }))).toBe(2);
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "150000 100000" }))).toBe(1.5);
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "max 100000" }))).toBeUndefined();
    expect(
      quotaCpus(
        files({ "/sys/fs/cgroup/cpu/cpu.cfs_quota_us": "50000", "/sys/fs/cgroup/cpu/cpu.cfs_period_us": "100000" }),
      ),
    ).toBe(0.5);
    expect(
      quotaCpus(
        files({ "/sys/fs/cgroup/cpu/cpu.cfs_quota_us": "-1", "/sys/fs/cgroup/cpu/cpu.cfs_period_us": "100000" }),
      ),
    ).toBeUndefined();
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "garbage" }))).toBeUndefined();
    expect(quotaCpus(files({}))).toBeUndefined();
  });
  it("is the CPUs the process may run on, capped by whole quota CPUs, at least 1", () => {
    const cpus = availableParallelism();
    expect(cpuBudget(files({}))).toBe(cpus);
    expect(cpuBudget(files({ "/sys/fs/cgroup/cpu.max": "100000 100000" }))).toBe(1);
    expect(cpuBudget(files({ "/sys/fs/cgroup/cpu.max": "50000 100000" }))).toBe(1);
    expect(cpuBudget(files({ "/sys/fs/cgroup/cpu.max": `${(cpus + 8) * 100000} 100000` }))).toBe(cpus);
  });
});
