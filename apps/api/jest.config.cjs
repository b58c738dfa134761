// API tests: real PostgreSQL (DATABASE_URL as the app role, DATABASE_OWNER_URL for fixtures),
// migrations already applied. Each file makes its own organisations, so files run in parallel.
module.exports = {
  displayName: 'api',
  rootDir: __dirname,
  testEnvironment: 'node',
  testMatch: ['<rootDir>/src/**/*.test.ts'],
  transform: { '^.+\\.ts$': require('../../jest.swc.cjs') },
  setupFiles: ['<rootDir>/src/test-support/jest-setup.ts'],
  testTimeout: 30000,
};
