#!/usr/bin/env node
import { fixtureCliMain } from './cli/run-fixture';

void fixtureCliMain(process.argv.slice(2)).then((code) => {
  if (code !== undefined) process.exit(code);
});
