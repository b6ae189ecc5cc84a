import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';

/** Demo data; filled in by the seeding work. Idempotent. */
export class DatabaseSeeder extends Seeder {
  async run(_em: EntityManager): Promise<void> {}
}
