// Every suite in one run; test/summary-reporter prints the `tests: N passed, N failed` line.
module.exports = {
  projects: [
    '<rootDir>/packages/calc/jest.config.cjs',
    '<rootDir>/apps/api/jest.config.cjs',
    '<rootDir>/apps/web/jest.config.cjs',
    '<rootDir>/test/jest.config.cjs',
  ],
  reporters: ['default', '<rootDir>/test/summary-reporter.cjs'],
};
