// Every suite in one run; test/summary-reporter prints the `tests: N passed, N failed` line.
module.exports = {
  projects: [
    '<rootDir>/packages/calc/jest.config.cjs',
    '<rootDir>/apps/api/jest.config.cjs',
    '<rootDir>/apps/web/jest.config.cjs',
    '<rootDir>/test/jest.config.cjs',
  ],
  // A global option (ignored inside projects): API fixtures hash passwords with argon2 and the
  // browser suites start Chromium, both slow on a loaded 2-core machine.
  testTimeout: 90_000,
  reporters: ['default', '<rootDir>/test/summary-reporter.cjs'],
};
