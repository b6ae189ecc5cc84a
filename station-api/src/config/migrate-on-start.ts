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
    return applied.map((m) => m.name);
  } finally {
    await orm.close(true);
  }
}
