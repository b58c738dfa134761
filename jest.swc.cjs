// Shared SWC transform for the Node-side jest projects (calc, api, test): TypeScript → CommonJS.
module.exports = ['@swc/jest', { jsc: { parser: { syntax: 'typescript', decorators: true }, target: 'es2022' }, module: { type: 'commonjs' } }];
