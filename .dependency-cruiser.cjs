/**
 * Dependency boundaries of Railwright, checked by `npm run check:boundaries` (dependency-cruiser).
 * Each rule says which folder may not reach which; the comment is the reason a person gets when it fails.
 * Type-only imports count too: a type pulled across a boundary couples the two sides just the same.
 */

// The simulated fixture, wherever it lives: the server's simulation module, the transport and fixture
// table that drive the simulator, and the simulator package itself (resolved through node_modules or as
// the workspace folder).
const SIMULATOR = [
  '^station-api/src/simulation/',
  '(^|/)simulated-fixtures[^/]*$',
  '(^|/)simulator\\.transport[^/]*$',
  '(^|/)node_modules/@railwright/mock-fixture/',
  // the package resolves through its workspace symlink to the folder itself
  '^mock-fixture/',
];

/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: 'pure-computation',
      comment:
        'measure/ and stats/ hold the pure computations (converter metrics, judging, statistics). They take ' +
        'numbers and return numbers, so they are tested without a server; they may not import NestJS, ' +
        'the ORM, the serial port or the fixture transport.',
      severity: 'error',
      from: { path: '^station-api/src/(measure|stats)/' },
      to: {
        path: [
          '(^|/)node_modules/@nestjs/',
          '(^|/)node_modules/@mikro-orm/',
          '(^|/)node_modules/serialport/',
          '(^|/)node_modules/@serialport/',
          '^station-api/src/fixtures/transport/',
        ],
      },
    },
    {
      name: 'pure-computation-transitive',
      comment:
        'The same rule through any chain of imports: a measure/ or stats/ file that imports an entity or a ' +
        'service pulls NestJS or the ORM in behind it. Keep shared enums and types in plain modules.',
      severity: 'error',
      from: { path: '^station-api/src/(measure|stats)/' },
      to: {
        path: [
          '(^|/)node_modules/@nestjs/',
          '(^|/)node_modules/@mikro-orm/',
          '(^|/)node_modules/serialport/',
          '(^|/)node_modules/@serialport/',
          '^station-api/src/fixtures/transport/',
        ],
        reachable: true,
      },
    },
    {
      name: 'fixture-link-not-simulator',
      comment:
        'The fixture link (station-api/src/fixtures) talks to a transport and knows nothing of the ' +
        'simulator: the simulation module registers its own transport for mock: port paths.',
      severity: 'error',
      from: { path: '^station-api/src/fixtures/' },
      to: { path: SIMULATOR },
    },
    {
      name: 'ui-feature-isolation',
      comment:
        'A UI feature (station-ui/src/features/<name>) does not import another feature. Code two ' +
        'features need goes to src/components, src/lib or src/config.',
      severity: 'error',
      from: { path: '^station-ui/src/features/([^/]+)/' },
      to: {
        path: '^station-ui/src/features/([^/]+)/',
        pathNot: '^station-ui/src/features/$1/',
      },
    },
    {
      name: 'ui-shared-not-feature',
      comment:
        'Shared UI code (src/components, src/lib, src/config, src/testing) is used by features and ' +
        'never imports one, so a feature can change without breaking the others.',
      severity: 'error',
      from: { path: '^station-ui/src/(components|lib|config|testing)/' },
      to: { path: '^station-ui/src/features/' },
    },
    {
      name: 'api-no-cycles',
      comment:
        'Files in station-api/src do not import each other in a circle: a cycle makes load order ' +
        'matter and hides which side owns a rule. Warn for now; the current cycles are listed by the check.',
      severity: 'warn',
      from: { path: '^station-api/src/' },
      to: { path: '^station-api/src/', circular: true },
    },
    {
      name: 'not-to-unresolvable',
      comment:
        'An import the checker cannot resolve is a boundary it cannot see (a missing package or a path ' +
        'alias this config does not know).',
      severity: 'error',
      from: {},
      to: { couldNotResolve: true },
    },
  ],
  options: {
    // Packages and built output are reported as targets (the rules need to see them) but not cruised.
    doNotFollow: { path: ['node_modules', '(^|/)dist/'] },
    // Count `import type` as well: see the note at the top.
    tsPreCompilationDeps: true,
    // The UI's `@/…`, `@contract/…` and `@station-events` aliases; the server and the simulated
    // fixture use relative imports and packages only.
    tsConfig: { fileName: 'tsconfig.depcruise.json' },
    enhancedResolveOptions: {
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      extensions: ['.ts', '.tsx', '.d.ts', '.js', '.mjs', '.cjs', '.json'],
    },
    reporterOptions: {
      text: { highlightFocused: true },
    },
  },
};
