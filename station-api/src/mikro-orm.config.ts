import { Migrator } from '@mikro-orm/migrations';
import { SeedManager } from '@mikro-orm/seeder';
import { defineConfig, Options, SqliteDriver } from '@mikro-orm/sqlite';
import { mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { loadEnv } from './config/env.validation';
import { ENTITIES } from './database/entities';

/** One ORM configuration for the CLI, the server and the tests. */
export function createOrmConfig(dbPath: string, overrides: Partial<Options> = {}): Options {
  if (dbPath !== ':memory:') mkdirSync(dirname(dbPath), { recursive: true });
  return defineConfig({
    driver: SqliteDriver,
    dbName: dbPath,
    entities: ENTITIES,
    extensions: [Migrator, SeedManager],
    // migrations compiled to dist/ at run time; loaded with import() so Vitest can load the .ts sources
    dynamicImportProvider: (id: string) => import(id),
    migrations: {
      path: join(__dirname, 'database', 'migrations'),
      pathTs: join(__dirname, '..', 'src', 'database', 'migrations'),
      glob: '!(*.d).{js,ts}',
      emit: 'ts',
      transactional: true,
      allOrNothing: true,
      // no schema snapshot after a run: migrations are written by hand (nothing diffs against it), and taking it
      // failed on every analysed database (MikroORM 6.6 reads `sqlite_stat1`'s untyped columns and throws after
      // the migrations committed, so a plant's first start after an upgrade stopped; test/migration-upgrade)
      snapshot: false,
      snapshotName: '.snapshot-railwright',
    },
    seeder: {
      path: join(__dirname, 'database', 'seeders'),
      pathTs: join(__dirname, '..', 'src', 'database', 'seeders'),
      defaultSeeder: 'DatabaseSeeder',
      emit: 'ts',
    },
    pool: {
      min: 1,
      max: 1,
      // WAL lets readers (yield screens) run while the engine writes; wait instead of failing on a lock
      afterCreate: (conn: SqliteConnection, done: (err: Error | null, conn: unknown) => void) => {
        conn.run('PRAGMA journal_mode = WAL', () =>
          conn.run('PRAGMA busy_timeout = 5000', () =>
            conn.run('PRAGMA foreign_keys = ON', (err: Error | null) => done(err, conn)),
          ),
        );
      },
    },
    // under Vitest the sources are .ts; built code runs from dist/
    preferTs: __filename.endsWith('.ts'),
    debug: false,
    allowGlobalContext: false,
    ...overrides,
  });
}

export default createOrmConfig(loadEnv().DATABASE_PATH);

/** The part of the sqlite3 driver's connection the pool's afterCreate hook uses. */
interface SqliteConnection {
  run(sql: string, callback: (err: Error | null) => void): void;
}
