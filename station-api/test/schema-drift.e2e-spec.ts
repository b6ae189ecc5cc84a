import { MikroORM } from '@mikro-orm/sqlite';
import { readFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

/*
 * Migrations are written by hand for SQLite (partial indexes, added columns); these checks keep them and the
 * entities telling the same story, and keep the migrator's snapshot current so the next generated migration
 * diffs against the real schema (`npm run db:snapshot -w station-api` rewrites it).
 */
describe('schema: migrations, entities and the snapshot agree', () => {
  let orm: MikroORM;
  let dir: string;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'railwright-schema-'));
    Object.assign(process.env, { DATABASE_PATH: join(dir, 'schema.sqlite'), JWT_SECRET: 'schema-test-secret-at-least-32-bytes-long', LOG_LEVEL: 'error' });
    const { default: config } = await import('../src/mikro-orm.config');
    orm = await MikroORM.init({ ...config, dbName: join(dir, 'schema.sqlite') });
    await orm.getMigrator().up();
  });

  afterAll(async () => {
    await orm?.close(true);
    rmSync(dir, { recursive: true, force: true });
  });

  it('a database built by the migrations needs no change to match the entities', async () => {
    const sql = await orm.schema.getUpdateSchemaSQL({ wrap: false });
    // partial unique indexes (one running run per unit/station) are invisible to the entity metadata and
    // would show up as drops; everything else must be empty
    const lines = sql
      .split('\n')
      .map((l) => l.trim())
      .filter((l) => l && !/^drop index `test_runs_one_running_per_(unit|station)`;$/.test(l) && !/^pragma /i.test(l));
    expect(lines).toEqual([]);
  });

  it('the committed snapshot is the schema the entities describe', async () => {
    const generator = orm.schema as unknown as { getTargetSchema(): unknown };
    const expected = JSON.parse(JSON.stringify(generator.getTargetSchema()));
    const snapshot = JSON.parse(readFileSync(join(__dirname, '..', 'src', 'database', 'migrations', '.snapshot-railwright.json'), 'utf8'));
    expect(snapshot).toEqual(expected);
  });
});
