import { MikroORM } from '@mikro-orm/sqlite';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

/*
 * Migrations are written by hand for SQLite (added columns, partial indexes), so nothing generates them from
 * the entities. This keeps the two telling the same story: every column an entity maps exists in a database
 * built by the migrations alone, and no table holds a column no entity knows. (MikroORM's own schema diff is
 * not used here: on SQLite it proposes table rebuilds even for identical tables.)
 */
describe('schema: the migrations build what the entities map', () => {
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

  it('has every mapped column, and only those, in every entity table', async () => {
    const conn = orm.em.getConnection();
    const problems: string[] = [];
    for (const meta of Object.values(orm.getMetadata().getAll())) {
      if (meta.embeddable || meta.virtual || !meta.tableName || meta.abstract) continue;
      const mapped = new Set(meta.props.flatMap((p) => (p.persist === false ? [] : (p.fieldNames ?? []))));
      const rows = await conn.execute<{ name: string }[]>(`pragma table_info(\`${meta.tableName}\`)`);
      const actual = new Set(rows.map((r) => r.name));
      if (actual.size === 0) problems.push(`table ${meta.tableName} (${meta.className}) is not created by any migration`);
      for (const c of mapped) if (!actual.has(c)) problems.push(`${meta.tableName}.${c} is mapped by ${meta.className} but no migration adds it`);
      for (const c of actual) if (!mapped.has(c)) problems.push(`${meta.tableName}.${c} exists but ${meta.className} does not map it`);
    }
    expect(problems).toEqual([]);
  });
});
