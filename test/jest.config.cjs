// Cross-cutting suites: browser end-to-end (playwright-core + Debian Chromium) against the real
// server started once for the run by e2e/global-setup.
module.exports = {
  displayName: 'e2e',
  rootDir: __dirname,
  testEnvironment: 'node',
  testMatch: ['<rootDir>/e2e/**/*.test.ts'],
  transform: { '^.+\\.ts$': require('../jest.swc.cjs') },
  globalSetup: '<rootDir>/e2e/global-setup.ts',
  globalTeardown: '<rootDir>/e2e/global-teardown.ts',
  // Honoured when this config runs alone; in `npm test` the root config's timeout applies.
  testTimeout: 90_000,
};
