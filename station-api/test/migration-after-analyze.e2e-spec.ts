import { MikroORM } from '@mikro-orm/sqlite';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

/*
 * A plant's database has planner statistics (start-up runs ANALYZE, which creates sqlite_stat1), and the next
 * release brings new migrations. Applying them must work: MikroORM's schema snapshot after a migration run
 * read sqlite_stat1's untyped columns and threw, so the first start-up after an upgrade failed (found while
 * applying Migration20261203030000 to a year of history, issue 11).
 */
describe('migrations: a database with planner statistics takes new migrations', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-analyzed-'));

  afterAll(() => {
    rmSync(dir, { recursive: true, force: true });
  });

  it('applies the pending migrations after ANALYZE', async () => {
    const dbPath = join(dir, 'analyzed.sqlite');
    Object.assign(process.env, { DATABASE_PATH: dbPath, JWT_SECRET: 'analyze-test-secret-at-least-32-bytes-long', LOG_LEVEL: 'error' });
    const { createOrmConfig } = await import('../src/mikro-orm.config');
    const first = await MikroORM.init(createOrmConfig(dbPath));
    const all = (await first.getMigrator().getPendingMigrations()).map((m) => m.name);
    expect(all.length).toBeGreaterThan(2);
    // an older release: every migration but the last two, then the statistics a running server keeps
    await first.getMigrator().up({ to: all[all.length - 3] });
    await first.em.getConnection().execute('ANALYZE');
    expect((await first.em.getConnection().execute('select count(*) as n from sqlite_stat1'))[0].n).toBeGreaterThan(0);
    await first.close(true);

    const upgraded = await MikroORM.init(createOrmConfig(dbPath));
    try {
      const applied = await upgraded.getMigrator().up();
      expect(applied.map((m) => m.name)).toEqual(all.slice(-2));
    } finally {
      await upgraded.close(true);
    }
  });
});
