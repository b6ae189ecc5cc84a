export * from './physics';
export * from './products';
export * from './defects';
export * from './unit-model';
export * from './protocol';
export * from './binding';
export {
  CLI_USAGE,
  CliUsageError,
  fixtureCliMain,
  parseFixtureArgs,
  runFixture,
  type FixtureCliOptions,
  type RunningFixture,
} from './cli/run-fixture';
