import { defineConfig } from "vitest/config";

/** npm run soak: the slow reliability tests (test/soak/*.soak.ts), against the built server. */
export default defineConfig({
  test: {
    include: ["test/soak/**/*.soak.ts"],
    globalSetup: ["test/helpers/build-once.ts"], // dist/ built once, on first use (the soak starts the built server)
    testTimeout: 300_000,
    reporters: ["default"],
  },
});
