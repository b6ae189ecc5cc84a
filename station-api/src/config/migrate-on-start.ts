import { MikroORM } from '@mikro-orm/sqlite';
import { createOrmConfig } from '../mikro-orm.config';

/**
 * Applies pending migrations with a short-lived ORM instance, before the Nest app is created.
 * A new DATABASE_PATH used to give an empty database on which every request answered 500.
 * @returns names of the migrations applied now
 */
export async function migrateDatabase(dbPath: string): Promise<string[]> {
  const orm = await MikroORM.init(createOrmConfig(dbPath));
  try {
    const applied = await orm.getMigrator().up();
    // the compact measurement storage (issue 11) leaves the old wide table's pages free, about two thirds of a
    // year's file: give them back once, right after the move (VACUUM cannot run inside the migration's
    // transaction; 10 s on a year of history; docs/storage-design.md states the disk it needs)
    if (applied.some((m) => m.name === 'Migration20261203010000')) await orm.em.getConnection().execute('vacuum');
    return applied.map((m) => m.name);
  } finally {
    await orm.close(true);
  }
}
