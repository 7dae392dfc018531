import { defineConfig } from "vitest/config";

// `npm test`: the unit and reference-value suite, kept to a few minutes on 2 cores.
export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    exclude: ["test/heavy/**", "node_modules/**"],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    // Node's rare exit-time deadlock with in-flight Maglev compile jobs (nodejs/node#54918)
    // hangs a worker about once in a hundred heavy runs; the mid-tier JIT is not needed.
    execArgv: ["--no-maglev"],
  },
});
