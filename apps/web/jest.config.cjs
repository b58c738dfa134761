// Web unit tests: jest-preset-angular (JIT compile through ts-jest) in jsdom, zoneless.
// Run from the repository root: npx jest -c apps/web/jest.config.cjs
const path = require('node:path');

/** @type {import('jest').Config} */
module.exports = {
  displayName: 'web',
  rootDir: __dirname,
  preset: 'jest-preset-angular',
  setupFilesAfterEnv: ['<rootDir>/src/setup-jest.ts'],
  testEnvironment: 'jsdom',
  testMatch: ['**/*.spec.ts'],
  transform: {
    '^.+\\.(ts|js|mjs|html|svg)$': [
      'jest-preset-angular',
      {
        tsconfig: path.join(__dirname, 'tsconfig.spec.json'),
        stringifyContentPathRegex: '\\.(html|svg)$',
      },
    ],
  },
};
