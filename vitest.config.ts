import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // names the run; dist/ is built at most once in it, by the first test file that needs the built
    // server or CLI (ensureBuilt); the others run from the sources without a build
    globalSetup: ["test/helpers/build-once.ts"],
    testTimeout: 60_000,
    reporters: ["default"],
  },
});
