// `npm run db:snapshot -w station-api`: rewrites the migrator's schema snapshot
// (src/database/migrations/.snapshot-railwright.json) from the entities, after migrations written by hand.
// The next `mikro-orm migration:create` then diffs against the real schema. Needs a build (dist/).
const { mkdtempSync, rmSync } = require('node:fs');
const { tmpdir } = require('node:os');
const { join } = require('node:path');

async function main() {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-snapshot-'));
  process.env.DATABASE_PATH = join(dir, 'snapshot.sqlite');
  const { MikroORM } = require('@mikro-orm/sqlite');
  const config = require('../dist/mikro-orm.config').default;
  const orm = await MikroORM.init({ ...config, dbName: process.env.DATABASE_PATH });
  try {
    await orm.getMigrator().storeCurrentSchema();
    console.log('snapshot written');
  } finally {
    await orm.close(true);
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
