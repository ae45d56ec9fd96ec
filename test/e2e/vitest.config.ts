// End-to-end tests in a real editor (see test/e2e/harness.ts); run by `npm run test:e2e`,
// kept out of `npm test` because starting the editor takes tens of seconds.
import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/e2e/**/*.e2e.ts'],
    fileParallelism: false,
    testTimeout: 120_000,
    hookTimeout: 240_000,
    reporters: ['default', 'json'],
    outputFile: { json: '.test-results/e2e.json' },
  },
});
