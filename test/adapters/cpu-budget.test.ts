import { availableParallelism } from "node:os";
import { describe, expect, it } from "vitest";
import { httpProcessesFromEnv } from "../../adapters/http/config.js";
import { cpuBudget, quotaCpus } from "../../adapters/cpu-budget.js";

const files = (m: Record<string, string>) => (p: string) => m[p];

describe("the CPU budget", () => {
  // cgroup v2 cpu.max is "<quota> <period>" or "max <period>"; v1 has cfs_quota_us (-1: none) and cfs_period_us (the kernel's cgroup documentation).
  it("reads a container's quota from cgroup v2 or v1, and none where it is unlimited or unreadable", () => {
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "200000 100000\n" }))).toBe(2);
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "150000 100000" }))).toBe(1.5);
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu.max": "max 100000" }))).toBeUndefined();
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu/cpu.cfs_quota_us": "50000", "/sys/fs/cgroup/cpu/cpu.cfs_period_us": "100000" }))).toBe(0.5);
    expect(quotaCpus(files({ "/sys/fs/cgroup/cpu/cpu.cfs_quota_us": "-1", "/sys/fs/cgroup/cpu/cpu.cfs_period_us": "100000" }))).toBeUndefined();
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
  it("gives one HTTP process per budget CPU by default, at most 4, and refuses a bad count", () => {
    expect(httpProcessesFromEnv({}, 1)).toBe(1);
    expect(httpProcessesFromEnv({}, 2)).toBe(2);
    expect(httpProcessesFromEnv({ BACKSTOP_HTTP_PROCESSES: "auto" }, 16)).toBe(4);
    expect(httpProcessesFromEnv({ BACKSTOP_HTTP_PROCESSES: "3" }, 1)).toBe(3);
    for (const bad of ["0", "-1", "1.5", "65", "two"]) expect(() => httpProcessesFromEnv({ BACKSTOP_HTTP_PROCESSES: bad }, 2)).toThrow(/BACKSTOP_HTTP_PROCESSES/);
  });
});
