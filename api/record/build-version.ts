import { existsSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const BUILD_ID = /^[A-Za-z0-9._-]{1,64}$/;

/** The version in backstop's package.json, found from this file upwards (sources, dist/ and the bundle). */
function packageVersion(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i += 1) {
    const file = join(dir, "package.json");
    if (existsSync(file)) {
      const pkg = JSON.parse(readFileSync(file, "utf8")) as { name?: unknown; version?: unknown };
      if (pkg.name === "backstop" && typeof pkg.version === "string") return pkg.version;
    }
    dir = dirname(dir);
  }
  throw new Error("backstop's package.json was not found above the code: the build version is unknown");
}

/**
 * The service's build version as a verdict record states it: the package version, and `+` the
 * build id where BACKSTOP_BUILD_ID is set (by the image build: `docker build --build-arg
 * BACKSTOP_BUILD_ID=$(git rev-parse --short HEAD)`). No clock: the same build answers the same.
 * A build id that is not 1-64 of `A-Z a-z 0-9 . _ -` is an error naming the variable.
 */
export function buildVersionOf(env: Readonly<Record<string, string | undefined>>): string {
  const id = env.BACKSTOP_BUILD_ID;
  if (id === undefined || id === "") return packageVersion();
  if (!BUILD_ID.test(id))
    throw new Error(`BACKSTOP_BUILD_ID must be 1-64 characters of A-Z, a-z, 0-9, ".", "_" or "-", got "${id}"`);
  return `${packageVersion()}+${id}`;
}

let cached: string | undefined;

/** This process's build version (read once; worker threads inherit the environment). */
export function buildVersion(): string {
  cached ??= buildVersionOf(typeof process === "undefined" ? {} : process.env);
  return cached;
}
