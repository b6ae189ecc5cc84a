import { MikroORM } from '@mikro-orm/core';
import { INestApplication } from '@nestjs/common';
import { Test } from '@nestjs/testing';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface TestApp {
  app: INestApplication;
  orm: MikroORM;
  dbPath: string;
  close(): Promise<void>;
}

/**
 * Boots the real Nest application on a fresh temporary SQLite file: migrations applied, demo plant seeded
 * (no run history). Each test file gets its own database.
 */
export async function createTestApp(env: Record<string, string> = {}): Promise<TestApp> {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-test-'));
  const dbPath = join(dir, 'test.sqlite');
  Object.assign(process.env, {
    DATABASE_PATH: dbPath,
    JWT_SECRET: 'test-secret-at-least-16-chars',
    FIXTURE_SIM_TIMING: 'instant',
    SEED_HISTORY: '0',
    LOG_LEVEL: 'error',
    UI_DIST: '',
    ...env,
  });
  // imported after the environment is set: the modules read it when they load
  const { AppModule } = await import('../src/app.module');
  const { configureApp } = await import('../src/app.setup');
  const { DatabaseSeeder } = await import('../src/database/seeders/DatabaseSeeder');
  const moduleRef = await Test.createTestingModule({ imports: [AppModule] }).compile();
  const app = moduleRef.createNestApplication({ logger: ['error'] });
  configureApp(app);
  const orm = app.get(MikroORM);
  await orm.getMigrator().up();
  await orm.getSeeder().seed(DatabaseSeeder);
  await app.init();
  return {
    app,
    orm,
    dbPath,
    async close() {
      await app.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
