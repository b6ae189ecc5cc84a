import { MikroORM } from '@mikro-orm/sqlite';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';

/** The key under which the template's path is provided to the test files (`inject(TEMPLATE_DATABASE_KEY)`). */
export const TEMPLATE_DATABASE_KEY = 'templateDatabasePath';

declare module 'vitest' {
  export interface ProvidedContext {
    templateDatabasePath: string;
  }
}

/**
 * The environment the template is migrated and seeded under: what createTestApp sets by default. A test app
 * asking for any other value of these keys migrates and seeds its own database instead of copying the template.
 */
export const TEMPLATE_SEED_ENV = { SEED_HISTORY: '0' } as const;

/**
 * Vitest globalSetup: migrates and seeds one SQLite file before any test file starts. Every createTestApp
 * then copies it (a few milliseconds) instead of applying every migration and hashing the demo users'
 * passwords again (3–5 s per test file on 2 cores). The schema and rows are exactly those of a fresh
 * migration and seed: the template is made by the same migrator and seeder, once per `vitest run`.
 */
export default async function setup(project: TestProject): Promise<() => void> {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-template-'));
  const dbPath = join(dir, 'template.sqlite');
  // the ORM config and the seeders read the environment as they load; this process runs no test, and
  // what is set here is put back before the test files start (they inherit this process's environment)
  const saved = { ...process.env };
  Object.assign(process.env, { DATABASE_PATH: dbPath, LOG_LEVEL: 'error', ...TEMPLATE_SEED_ENV });
  try {
    const { createOrmConfig } = await import('../../src/mikro-orm.config');
    const { DatabaseSeeder } = await import('../../src/database/seeders/DatabaseSeeder');
    const orm = await MikroORM.init(createOrmConfig(dbPath));
    try {
      await orm.getMigrator().up();
      await orm.getSeeder().seed(DatabaseSeeder);
    } finally {
      await orm.close(true);
    }
  } finally {
    for (const key of Object.keys(process.env)) if (!(key in saved)) delete process.env[key];
    Object.assign(process.env, saved);
  }
  // closing the only connection checkpoints the write-ahead log into the file; a left-over log would mean
  // the copy misses rows
  if (existsSync(`${dbPath}-wal`)) throw new Error(`The template database ${dbPath} kept a write-ahead log after closing`);
  project.provide(TEMPLATE_DATABASE_KEY, dbPath);
  return () => rmSync(dir, { recursive: true, force: true });
}
