// Lets a child `node` run the TypeScript sources directly (start-up tests): compiles each .ts file with
// @swc/core as CommonJS with decorator metadata, as unplugin-swc does for Vitest.
const { transformSync } = require('@swc/core');
const { readFileSync } = require('node:fs');
const Module = require('node:module');

Module._extensions['.ts'] = function compileTs(module, filename) {
  const { code } = transformSync(readFileSync(filename, 'utf8'), {
    filename,
    sourceMaps: 'inline',
    jsc: {
      parser: { syntax: 'typescript', decorators: true },
      transform: { legacyDecorator: true, decoratorMetadata: true },
      target: 'es2022',
      keepClassNames: true,
    },
    module: { type: 'commonjs' },
  });
  module._compile(code, filename);
};
