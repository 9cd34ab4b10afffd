import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // builds dist/ once: the server, CLI and worker-thread tests run the built code
    globalSetup: ["test/helpers/build-once.ts"],
    testTimeout: 60_000,
    reporters: ["default"],
  },
});
