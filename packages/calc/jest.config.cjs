module.exports = {
  displayName: 'calc',
  rootDir: __dirname,
  testEnvironment: 'node',
  testMatch: ['<rootDir>/src/**/*.test.ts'],
  transform: { '^.+\\.ts$': require('../../jest.swc.cjs') },
};
