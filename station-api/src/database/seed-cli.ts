import 'reflect-metadata';
import { MikroORM } from '@mikro-orm/sqlite';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot } from '../lots/lot.entity';
import { Product } from '../products/product.entity';
import { Station } from '../stations/station.entity';
import { Unit } from '../units/unit.entity';
import { User } from '../users/user.entity';
import { DatabaseSeeder } from './seeders/DatabaseSeeder';
import { refreshPlannerStatistics } from './maintenance/planner-statistics';

/**
 * `npm run db:seed`: applies pending migrations, then runs the (idempotent) DatabaseSeeder and prints
 * one line of counts. Exit code 1 with a readable message on failure.
 */
async function main(): Promise<void> {
  // loaded here, not at the top, so a bad setting (read while the config loads) ends in the readable
  // message below instead of a stack trace
  const { default: config } = await import('../mikro-orm.config');
  const orm = await MikroORM.init(config);
  try {
    const applied = await orm.getMigrator().up();
    await orm.getSeeder().seed(DatabaseSeeder);
    // the history seed wrote thousands of runs: give the planner their statistics now
    await refreshPlannerStatistics(orm.em.getConnection());
    const em = orm.em.fork();
    const [users, products, fixtures, stations, lots, units] = await Promise.all([
      em.count(User),
      em.count(Product),
      em.count(Fixture),
      em.count(Station),
      em.count(Lot),
      em.count(Unit),
    ]);
    console.log(
      `Seeded ${config.dbName}: ${applied.length} migration(s) applied; ${users} users, ${products} products, ${fixtures} fixtures, ` +
        `${stations} stations, ${lots} lots, ${units} units.`,
    );
  } finally {
    await orm.close(true);
  }
}

main().catch((err: unknown) => {
  console.error(`Seeding failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
