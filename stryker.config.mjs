// Mutation testing of the evaluator and the section engine (`npm run mutation`; not part of
// `npm test`). StrykerJS changes one operator, condition or constant at a time and reruns the tests
// that cover it; a mutant no test notices (it "survives") marks behaviour the tests do not pin down.
//
// The whole scope takes a long time on a small machine; narrow it for a quick look, e.g.
//   npx stryker run stryker.config.mjs --mutate src/core/evaluate.ts
//   npx stryker run stryker.config.mjs --mutate "src/core/section/section.ts:600-700"
// Reports land in reports/mutation/ (HTML and JSON); `incremental` reuses earlier results for code
// and tests that did not change.
/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
  packageManager: 'npm',
  testRunner: 'vitest',
  plugins: ['@stryker-mutator/vitest-runner'],
  vitest: { configFile: 'vitest.config.ts', related: false },
  mutate: ['src/core/evaluate.ts', 'src/core/section/section.ts'],
  // The suites that pin the evaluator and the section engine down, in process and quickly; the
  // language server, CLI, browser and editor suites run other processes that would not see a mutant.
  testFiles: [
    'test/core/note.test.ts',
    'test/core/language-reference.test.ts',
    'test/core/section-reference.test.ts',
    'test/core/section-problems.test.ts',
    'test/core/section-properties.test.ts',
    'test/core/section-crosscheck.test.ts',
    'test/fuzz/regressions.test.ts',
    'test/fuzz/evaluator.oracle.test.ts',
    'test/fuzz/section.fuzz.test.ts',
    'test/fuzz/note.fuzz.test.ts',
  ],
  coverageAnalysis: 'perTest',
  // Two cores: one or two test-runner processes.
  concurrency: 2,
  timeoutMS: 20_000,
  timeoutFactor: 2,
  ignoreStatic: true,
  reporters: ['clear-text', 'progress', 'html', 'json'],
  htmlReporter: { fileName: 'reports/mutation/index.html' },
  jsonReporter: { fileName: 'reports/mutation/mutation.json' },
  incremental: true,
  incrementalFile: 'reports/mutation/stryker-incremental.json',
  tempDirName: '.stryker-tmp',
  ignorePatterns: ['dist', '.e2e', 'test-artifacts', 'coverage', 'reports', '*.vsix'],
  thresholds: { high: 85, low: 70, break: null },
};
