import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { assertBuilt } from './repo';
import { baseEnv, seedDatabase } from './server';

declare module 'vitest' {
  export interface ProvidedContext {
    /** A migrated and seeded database (no run history) that startStationServer copies. */
    templateDatabasePath: string;
  }
}

/**
 * globalSetup of the browser tests: runs the built seed command once, before any spec file, on a template
 * database. Each startStationServer copies it (milliseconds) instead of starting its own seed process
 * (migrations and five password hashes: seconds on 2 cores, once per spec file).
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  assertBuilt();
  const dir = await mkdtemp(join(tmpdir(), 'railwright-e2e-template-'));
  const dbPath = join(dir, 'template.sqlite');
  try {
    await seedDatabase(baseEnv(dbPath));
  } catch (e) {
    await rm(dir, { recursive: true, force: true });
    throw new Error(`Seeding the browser tests' template database failed. ${(e as Error).message}`, { cause: e });
  }
  // the seed command closes its only connection, which folds the write-ahead log into the file
  if (existsSync(`${dbPath}-wal`)) throw new Error(`The template database ${dbPath} kept a write-ahead log after seeding`);
  project.provide('templateDatabasePath', dbPath);
  return () => rm(dir, { recursive: true, force: true });
}
