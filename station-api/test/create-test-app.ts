import { MikroORM } from '@mikro-orm/core';
import { INestApplication, Type } from '@nestjs/common';
import { Test } from '@nestjs/testing';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';

export interface TestApp {
  app: INestApplication;
  orm: MikroORM;
  dbPath: string;
  close(): Promise<void>;
}

export interface TestAppOptions {
  /** Extra controllers mounted beside the real ones (e.g. to probe the global guards) */
  controllers?: Type<unknown>[];
}

/** The JWT secret the test apps sign with (to forge or pre-date tokens in tests). */
export const TEST_JWT_SECRET = 'test-secret-at-least-32-bytes-long-0123456789';

/**
 * Boots the real Nest application on a fresh temporary SQLite file: migrations applied, demo plant seeded
 * (no run history). Each test file gets its own database.
 * The sign-in rate limit is raised so that tests logging in often are never throttled; the throttling
 * test passes its own LOGIN_ATTEMPTS_PER_MINUTE.
 */
export async function createTestApp(env: Record<string, string> = {}, options: TestAppOptions = {}): Promise<TestApp> {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-test-'));
  const dbPath = join(dir, 'test.sqlite');
  Object.assign(process.env, {
    DATABASE_PATH: dbPath,
    JWT_SECRET: TEST_JWT_SECRET,
    FIXTURE_SIM_TIMING: 'instant',
    SEED_HISTORY: '0',
    LOG_LEVEL: 'error',
    UI_DIST: '',
    LOGIN_ATTEMPTS_PER_MINUTE: '100000',
    ...env,
  });
  // imported after the environment is set: the modules read it when they load
  const { AppModule } = await import('../src/app.module');
  const { configureApp } = await import('../src/app.setup');
  const { DatabaseSeeder } = await import('../src/database/seeders/DatabaseSeeder');
  const moduleRef = await Test.createTestingModule({ imports: [AppModule], controllers: options.controllers ?? [] }).compile();
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

/**
 * Signs in through the real login route and returns the bearer token.
 * The demo users' passwords are `<username>-demo`, the default here.
 */
export async function login(app: INestApplication, username: string, password = `${username}-demo`): Promise<string> {
  const res = await request(app.getHttpServer()).post('/api/auth/login').send({ username, password });
  if (res.status !== 200) throw new Error(`login as ${username} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.accessToken as string;
}
